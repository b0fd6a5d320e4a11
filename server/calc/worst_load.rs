//! Worst load, stated: every scenario is judged at the load in the recorded range
//! `[min_load, load]` that gives each end its highest pressure (DESIGN.md "Safety rules").
//!
//! Why the two ends of the range are enough: with the valve centred and the load held, every
//! scenario's pressure at each end is a straight line in the load (force balance on the
//! piston, `p A = F + ...`) or such a line cut off at zero (`max(0, a + b F)`, e.g. rod-side
//! intensification with a pushing load, which drives the piston home instead). A straight line,
//! and the larger of a line and zero, takes its highest value over an interval at one of the
//! interval's ends (a convex function on an interval is highest at an end point). So each
//! scenario is worked out at the lightest and at the heaviest load, and each end keeps the
//! higher of its two figures, with the load that gave it. A scenario may be worst at the heavy
//! load for one end and at the light load for the other: the ends are taken one by one.
//!
//! Rule of our own: on a tie the heavier load is named (it is the load that was recorded).

use super::analysis::CylinderInput;
use super::ratings::Scenario;

/// The load range of an input, N: `(lightest, heaviest)`. Without a `min_load` the range is
/// the one load given.
pub fn range(input: &CylinderInput) -> (f64, f64) {
    (input.min_load.unwrap_or(input.load), input.load)
}

/// The same input at the lightest load of its range, with the range closed (so that analysing
/// it does not widen again); `None` when the range is a single load.
pub fn lightest(input: &CylinderInput) -> Option<CylinderInput> {
    let (light, heavy) = range(input);
    (light < heavy).then(|| {
        let mut at_light = input.clone();
        at_light.load = light;
        at_light.min_load = None;
        at_light
    })
}

/// Each scenario of `heavy` (worked out at the heaviest load) with each end's figure raised to
/// the one `light` gives (the same scenario, by name, at the lightest load) where that is
/// higher, and that end's load changed with it. A scenario found at one load only is kept as
/// it is: a scenario that exists only at the light load is added.
pub fn worst_of(heavy: Vec<Scenario>, light: &[Scenario]) -> Vec<Scenario> {
    let mut out: Vec<Scenario> = heavy
        .into_iter()
        .map(|h| match light.iter().find(|l| l.name == h.name) {
            Some(l) => worst_pair(h, l),
            None => h,
        })
        .collect();
    for l in light {
        if !out.iter().any(|s| s.name == l.name) {
            out.push(*l);
        }
    }
    out
}

fn worst_pair(heavy: Scenario, light: &Scenario) -> Scenario {
    let mut s = heavy;
    if light.cap > heavy.cap {
        s.cap = light.cap;
        s.cap_load = light.cap_load;
    }
    if light.rod > heavy.rod {
        s.rod = light.rod;
        s.rod_load = light.rod_load;
    }
    s
}

/// The named scenario of a list, if there.
pub fn find<'a>(scenarios: &'a [Scenario], name: &str) -> Option<&'a Scenario> {
    scenarios.iter().find(|s| s.name == name)
}
