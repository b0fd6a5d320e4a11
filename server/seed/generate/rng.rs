//! A tiny deterministic pseudo-random source for the scale generator: xorshift64* seeded per
//! item through splitmix64, so a machine's data depends only on the seed and its index (not
//! on the order or batching in which machines are made).

/// xorshift64* state (never zero).
#[derive(Clone, Debug)]
pub struct Rng(u64);

/// splitmix64: spreads a seed over all 64 bits (Steele, Lea and Flood's mixing constants).
fn splitmix64(mut z: u64) -> u64 {
    z = z.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

impl Rng {
    /// The stream for item `index` of stream `stream` under `seed`.
    pub fn for_item(seed: u64, stream: u64, index: u64) -> Rng {
        let mixed = splitmix64(seed ^ splitmix64(stream.wrapping_mul(31).wrapping_add(index)));
        Rng(if mixed == 0 {
            0x2545_F491_4F6C_DD1D
        } else {
            mixed
        })
    }

    pub fn next_u64(&mut self) -> u64 {
        let mut x = self.0;
        x ^= x >> 12;
        x ^= x << 25;
        x ^= x >> 27;
        self.0 = x;
        x.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform in `[0, 1)`.
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    /// Uniform integer in `[0, n)`; 0 when `n` is 0.
    pub fn below(&mut self, n: u64) -> u64 {
        if n == 0 {
            0
        } else {
            ((u128::from(self.next_u64()) * u128::from(n)) >> 64) as u64
        }
    }

    /// Uniform integer in `[lo, hi]`.
    pub fn int(&mut self, lo: i64, hi: i64) -> i64 {
        if hi <= lo {
            lo
        } else {
            lo + self.below((hi - lo + 1) as u64) as i64
        }
    }

    /// Uniform in `[lo, hi)`.
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.unit()
    }

    /// True with probability `p`.
    pub fn chance(&mut self, p: f64) -> bool {
        self.unit() < p
    }

    /// One element of a non-empty slice.
    pub fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.below(items.len() as u64) as usize]
    }
}
