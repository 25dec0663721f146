//! The one font plot text is measured with, embedded so plots work on a machine without
//! system fonts (DejaVu Sans; licence in assets/fonts/).
use std::sync::OnceLock;

/// Family name written into the SVG: the viewer uses DejaVu Sans if present, else its sans.
pub const FAMILY: &str = "DejaVu Sans, sans-serif";

static FONT: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");
static REGISTERED: OnceLock<Result<(), String>> = OnceLock::new();

/// Register the embedded font with plotters (once per process); plotters panics on text
/// without a registered font, so every plot calls this first.
pub fn ensure() -> Result<(), String> {
    REGISTERED
        .get_or_init(|| {
            use plotters::style::FontStyle;
            for style in [FontStyle::Normal, FontStyle::Bold] {
                plotters::style::register_font(FAMILY, style, FONT)
                    .map_err(|_| "the embedded plot font could not be loaded".to_string())?;
            }
            Ok(())
        })
        .clone()
}
