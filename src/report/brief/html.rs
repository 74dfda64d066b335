//! HTML helpers of the brief: escaping, the stylesheet (screen and print), dates.

/// Escapes text for HTML element content and attribute values (ids and names are user
/// input): `&`, `<`, `>`, `"`, `'`.
pub fn esc(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for ch in text.chars() {
        match ch {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            // Control characters other than tab and newline have no place in a document.
            c if c.is_control() && c != '\t' && c != '\n' => out.push('\u{FFFD}'),
            c => out.push(c),
        }
    }
    out
}

/// The calendar date (UTC) of a Unix timestamp, `YYYY-MM-DD` (proleptic Gregorian; the
/// days-to-civil algorithm of H. Hinnant, "chrono-Compatible Low-Level Date Algorithms").
pub fn date_utc(unix_seconds: i64) -> String {
    let z = unix_seconds.div_euclid(86_400) + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1_460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

/// The stylesheet. Print: A4 and Letter both fit (content width 180 mm at most, margins
/// 14 mm), each major section starts a page, tables repeat their header row, nothing
/// relies on colour (class = shape + shade + words; plans marked with words).
pub const CSS: &str = r#"
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, Helvetica, sans-serif;
  color: #111; background: #fff; font-size: 10.5pt; line-height: 1.4;
  max-width: 190mm; margin: 0 auto; padding: 10mm 8mm; }
.caution { border: 2px solid #111; padding: 6px 10px; font-weight: bold; margin: 0 0 4px 0; }
.meta { font-size: 7.5pt; color: #333; margin: 2px 0 10px 0; overflow-wrap: anywhere; }
h1 { font-size: 19pt; margin: 10px 0 6px 0; }
h2 { font-size: 13.5pt; margin: 14px 0 6px 0; border-bottom: 1.5px solid #444; padding-bottom: 2px; }
h3 { font-size: 11pt; margin: 6px 0 4px 0; }
p { margin: 4px 0 6px 0; }
.lead p { font-size: 11.5pt; }
table { border-collapse: collapse; width: 100%; font-size: 8.5pt; margin: 4px 0 8px 0; }
th, td { border: 1px solid #999; padding: 2px 4px; vertical-align: top; text-align: left; }
th { background: #e4e4e4; font-weight: bold; }
td.n, th.n { text-align: right; font-variant-numeric: tabular-nums; }
td.n .note { display: block; text-align: left; }
td.c { white-space: nowrap; }
thead { display: table-header-group; }
tr { break-inside: avoid; page-break-inside: avoid; }
.icon { vertical-align: -3px; margin-right: 3px; }
svg.map { width: 100%; height: auto; display: block; border: 0; }
svg.map text { font-family: inherit; font-size: 13px; fill: #111; }
svg.map text.rank { font-weight: bold; font-size: 15px; paint-order: stroke; stroke: #fff;
  stroke-width: 3px; stroke-linejoin: round; }
svg.map text.dname { font-size: 15px; fill: #555; font-style: italic; paint-order: stroke;
  stroke: #fff; stroke-width: 3px; }
svg.map text.fname { font-size: 13px; font-weight: bold; paint-order: stroke; stroke: #fff;
  stroke-width: 3px; }
.legend { font-size: 8.5pt; display: flex; flex-wrap: wrap; gap: 4px 14px; margin: 4px 0; }
.plans { display: flex; gap: 5mm; align-items: flex-start; }
.plan { flex: 1 1 0; border: 1.5px solid #444; padding: 6px 8px; min-width: 0; }
.plan h3 { margin-top: 0; }
.plan .figures { font-size: 10.5pt; margin: 2px 0 6px 0; }
.plan table { font-size: 8pt; }
.box { border: 1.5px solid #444; padding: 6px 10px; background: #f3f3f3; }
.box ul { margin: 4px 0; padding-left: 18px; }
.note { font-size: 8.5pt; color: #333; }
.yes { font-weight: bold; }
section { margin-bottom: 6px; }
@page { margin: 14mm 12mm; }
@media print {
  body { max-width: none; padding: 0; font-size: 10pt; }
  section.page { break-before: page; page-break-before: always; }
  .keep { break-inside: avoid; page-break-inside: avoid; }
  .box, .plan, .map-wrap, .legend { break-inside: avoid; page-break-inside: avoid; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  .box { background: #fff; }
  /* The map shares the first page with the summary (A4 and Letter). */
  svg.map { max-height: 105mm; }
}
"#;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_markup_and_quotes() {
        assert_eq!(
            esc("<b a=\"x\">Tom & 'Jo'</b>"),
            "&lt;b a=&quot;x&quot;&gt;Tom &amp; &#39;Jo&#39;&lt;/b&gt;"
        );
        assert_eq!(esc("a\u{0}b"), "a\u{FFFD}b");
    }

    #[test]
    fn dates_from_timestamps() {
        // 0 = 1970-01-01; 951,782,400 = 2000-02-29 (a leap day); 1,798,761,600 = 2027-01-01.
        assert_eq!(date_utc(0), "1970-01-01");
        assert_eq!(date_utc(951_782_400), "2000-02-29");
        assert_eq!(date_utc(1_798_761_600), "2027-01-01");
        assert_eq!(date_utc(-86_400), "1969-12-31");
    }
}
