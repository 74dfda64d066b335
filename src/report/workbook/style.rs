/*!
Cell formats of the results workbook, including the class palette.

The class palette is this project's own: a single violet hue ramp from dark (class 1,
collapse-level deficit) to pale (class 4, within screening limits), with white text on the
two dark shades. It reads in order of severity in colour and in greyscale, and every class
cell also carries the class number and name as text (number format), so nothing depends on
colour alone.
*/

use rust_xlsxwriter::{Color, Format, FormatAlign, FormatBorder};

use super::tables::{CLASS_NAMES, CellKind};

/// Fill colours of classes 1–4 (most to least severe): one violet hue, dark to pale.
/// Relative luminance about 0.03, 0.14, 0.45, 0.84, so greyscale keeps the order.
pub const CLASS_FILL: [u32; 4] = [0x2A_1A_4A, 0x5B_47_8C, 0xB0_A4_D0, 0xEE_EA_F6];
/// Chart fills of classes 1–4: the same hue ramp, the two pale shades a step darker so that
/// markers and bars stay visible on a white plot area.
pub const CLASS_CHART_FILL: [u32; 4] = [0x2A_1A_4A, 0x5B_47_8C, 0x9A_8C_C4, 0xCE_C6_E6];
/// Font colours of classes 1–4 (white on the two dark shades).
pub const CLASS_FONT: [u32; 4] = [0xFF_FF_FF, 0xFF_FF_FF, 0x1A_1A_1A, 0x1A_1A_1A];
/// Header fill: a neutral grey, distinct from every class shade.
const HEADER_FILL: u32 = 0xD9_D9_D9;

/// Every format the workbook uses.
#[derive(Debug, Clone)]
pub struct Styles {
    /// Table header: bold, wrapped, grey fill, bottom border.
    pub header: Format,
    /// Number formats per column kind (index by [`Styles::kind`]).
    kinds: [Format; 11],
    /// Class cells 1–4.
    pub class: [Format; 4],
    /// Sheet title.
    pub title: Format,
    /// Section heading.
    pub section: Format,
    /// Label in a label/value block.
    pub label: Format,
    /// Wrapped plain text.
    pub wrap: Format,
    /// The caution: bold, wrapped.
    pub caution: Format,
    /// Date and time.
    pub datetime: Format,
    /// Plain text with no special format.
    pub text: Format,
    /// Whole number aligned left (ranks in the Summary's top ten).
    pub int_left: Format,
    /// Text indented one step (keeps a text column apart from a number to its left).
    pub indent: Format,
}

fn kind_index(k: CellKind) -> usize {
    match k {
        CellKind::Text => 0,
        CellKind::Int => 1,
        CellKind::Thousands => 2,
        CellKind::Dcr => 3,
        CellKind::Ratio => 4,
        CellKind::Pct => 5,
        CellKind::Dec2 => 6,
        CellKind::Dec3 => 7,
        CellKind::Dec4 => 8,
        CellKind::Coord => 9,
        CellKind::Class => 10,
    }
}

impl Styles {
    /// Builds the formats.
    pub fn new() -> Self {
        // Table cells align to the top, so that a row with wrapped text reads across.
        let num = |f: &str| Format::new().set_num_format(f).set_align(FormatAlign::Top);
        let class = std::array::from_fn(|i| {
            let name = CLASS_NAMES.get(i).copied().unwrap_or("");
            let fill = CLASS_FILL.get(i).copied().unwrap_or(0xFF_FF_FF);
            let font = CLASS_FONT.get(i).copied().unwrap_or(0);
            let mut f = Format::new()
                .set_num_format(format!("0\" {name}\""))
                .set_background_color(Color::RGB(fill))
                .set_font_color(Color::RGB(font))
                .set_align(FormatAlign::Left)
                .set_align(FormatAlign::Top);
            if i == 0 {
                f = f.set_bold();
            }
            f
        });
        Styles {
            header: Format::new()
                .set_bold()
                .set_text_wrap()
                .set_align(FormatAlign::Top)
                .set_background_color(Color::RGB(HEADER_FILL))
                .set_border_bottom(FormatBorder::Thin),
            kinds: [
                Format::new().set_align(FormatAlign::Top),
                num("0"),
                num("#,##0"),
                num("0.00"),
                num("0.00%"),
                num("0.00"),
                num("0.00"),
                num("0.000"),
                num("0.0000"),
                num("0.000000"),
                num("0"),
            ],
            class,
            title: Format::new().set_bold().set_font_size(16),
            section: Format::new()
                .set_bold()
                .set_font_size(12)
                .set_border_bottom(FormatBorder::Thin),
            label: Format::new().set_bold().set_align(FormatAlign::Top),
            wrap: Format::new().set_text_wrap().set_align(FormatAlign::Top),
            caution: Format::new()
                .set_bold()
                .set_text_wrap()
                .set_align(FormatAlign::Top)
                .set_border(FormatBorder::Thin),
            datetime: Format::new()
                .set_num_format("yyyy-mm-dd hh:mm \"UTC\"")
                .set_align(FormatAlign::Left),
            text: Format::new(),
            int_left: num("0").set_align(FormatAlign::Left),
            indent: Format::new().set_indent(1),
        }
    }

    /// The number format of a column kind.
    pub fn kind(&self, k: CellKind) -> &Format {
        // kind_index is always within the array.
        &self.kinds[kind_index(k)]
    }

    /// The format of a class cell (classes outside 1–4 get the plain integer format).
    pub fn class_format(&self, class: f64) -> &Format {
        match class as i64 {
            1..=4 => &self.class[(class as usize) - 1],
            _ => self.kind(CellKind::Int),
        }
    }
}

/// What a sheet repeats on every printed page and whether it prints by default.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Print {
    /// Header rows repeated on every page (first, last).
    pub repeat_rows: Option<(u32, u32)>,
    /// Id columns repeated on every page (first, last).
    pub repeat_cols: Option<(u16, u16)>,
    /// Printed only on request: the print area is the header row alone (Directions, Walls,
    /// Flags: an engineer's tables, tens of pages for a small stock). LibreOffice and Excel
    /// print only the print area of a sheet that has one; selecting rows and printing the
    /// selection, or clearing the print area, prints the table.
    pub on_request: Option<u16>,
}

/// Escapes `&` in text placed in a page header or footer (`&` starts a code there).
fn header_text(text: &str) -> String {
    text.replace('&', "&&")
}

/// Page setup of a sheet for print and for officials: landscape, fit to one page wide
/// (any number of pages tall), the sheet and the inventory in the page header, the caution
/// and "page N of M" in the footer, header rows and id columns repeated on every page.
pub fn page_setup(
    ws: &mut rust_xlsxwriter::Worksheet,
    sheet: &str,
    inventory: &str,
    print: Print,
) -> Result<(), rust_xlsxwriter::XlsxError> {
    ws.set_landscape();
    ws.set_print_fit_to_pages(1, 0);
    ws.set_margins(0.5, 0.5, 0.75, 0.75, 0.3, 0.3);
    // Excel limits each of header and footer to 255 characters; the caution (about 170)
    // fits with the codes. A long inventory name is cut.
    let file: String = inventory.chars().take(120).collect();
    let mut head = format!("&L&8{}", header_text(sheet));
    if print.on_request.is_some() {
        head.push_str(" (not printed by default: print a selection, or clear the print area)");
    }
    head.push_str(&format!("&R&8{}", header_text(&file)));
    ws.set_header(head);
    ws.set_footer(format!(
        "&L&7{}&R&8Page &P of &N",
        header_text(crate::CAUTION)
    ));
    if let Some((a, b)) = print.repeat_rows {
        ws.set_repeat_rows(a, b)?;
    }
    if let Some((a, b)) = print.repeat_cols {
        ws.set_repeat_columns(a, b)?;
    }
    if let Some(last_col) = print.on_request {
        ws.set_print_area(0, 0, 0, last_col)?;
    }
    Ok(())
}

impl Default for Styles {
    fn default() -> Self {
        Self::new()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Relative luminance (sRGB → linear, ITU-R BT.709 weights, as in WCAG 2.x).
    fn luminance(rgb: u32) -> f64 {
        let ch = |s: u32| {
            let c = f64::from(s & 0xFF) / 255.0;
            if c <= 0.03928 {
                c / 12.92
            } else {
                ((c + 0.055) / 1.055).powf(2.4)
            }
        };
        0.2126 * ch(rgb >> 16) + 0.7152 * ch(rgb >> 8) + 0.0722 * ch(rgb)
    }

    fn contrast(a: u32, b: u32) -> f64 {
        let (la, lb) = (luminance(a), luminance(b));
        (la.max(lb) + 0.05) / (la.min(lb) + 0.05)
    }

    #[test]
    fn palette_reads_in_order_in_greyscale() {
        // Class 1 darkest to class 4 lightest, with clear steps between neighbours.
        for pair in CLASS_FILL.windows(2) {
            assert!(luminance(pair[0]) < luminance(pair[1]));
            assert!(contrast(pair[0], pair[1]) > 1.6, "{pair:x?}");
        }
    }

    #[test]
    fn chart_shades_keep_the_order_and_stand_off_a_white_plot() {
        for pair in CLASS_CHART_FILL.windows(2) {
            assert!(luminance(pair[0]) < luminance(pair[1]));
        }
        // Even the palest shade differs from white by more than 1.4:1 (WCAG contrast ratio).
        assert!(contrast(CLASS_CHART_FILL[3], 0xFF_FF_FF) > 1.4);
    }

    #[test]
    fn class_text_is_legible_on_its_fill() {
        // WCAG 2.x contrast ratio at least 4.5:1 (WCAG 2.1 success criterion 1.4.3).
        for (fill, font) in CLASS_FILL.iter().zip(CLASS_FONT) {
            assert!(contrast(*fill, font) >= 4.5, "{fill:06x} / {font:06x}");
        }
    }
}
