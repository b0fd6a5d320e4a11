//! A QR code as SVG, drawn from the module matrix of the `qrcode` crate (its own renderers are
//! left out): one path of unit squares, with the four-module quiet zone the QR symbology asks
//! for around it.

use qrcode::{Color, EcLevel, QrCode};

/// Width of the quiet zone, modules.
pub const QUIET: usize = 4;

/// An SVG-ready QR code: the side in modules (quiet zone included) and the path of the dark
/// modules, numbers only.
#[derive(Clone, Debug)]
pub struct QrSvg {
    pub size: usize,
    pub path: String,
}

/// Encodes `data` (error correction level M: about 15 % of the symbol can be lost to a scuff
/// or a smear and still read); `None` if it does not fit a QR code.
pub fn encode(data: &str) -> Option<QrSvg> {
    let code = QrCode::with_error_correction_level(data.as_bytes(), EcLevel::M).ok()?;
    let width = code.width();
    let colors = code.to_colors();
    let mut path = String::new();
    for (i, color) in colors.iter().enumerate() {
        if *color == Color::Dark {
            let (x, y) = (i % width + QUIET, i / width + QUIET);
            path.push_str(&format!("M{x} {y}h1v1h-1z"));
        }
    }
    Some(QrSvg {
        size: width + 2 * QUIET,
        path,
    })
}
