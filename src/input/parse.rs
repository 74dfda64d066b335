/*!
Typed cells → typed records, one row at a time, with a problem for every cell that cannot be
read or is out of its plausible range (`sheet, row, column: expected …, found …`). No
defaults of the method are applied: a blank optional cell stays `None`.
*/

use super::columns::{BUILDINGS, ERAS, FOOTPRINTS, STOREYS, SheetSpec, WALLS};
use super::raw::{DataRow, RawCell, format_number};
use super::spreadsheet::year_of_serial;
use crate::model::{
    BuildingRecord, Dir, FootprintVertex, GroundType, Problem, Severity, StoreyRecord, Use,
    WallRecord, YesNo,
};

/// Plausibility limits of inventory.md (errors and warnings of single values).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limits {
    /// Storeys above this are refused.
    pub max_storeys: f64,
    /// Storey heights outside this range give a warning (m).
    pub storey_height_m: (f64, f64),
    /// Floor weights outside this range give a warning (kPa).
    pub floor_weight_kpa: (f64, f64),
    /// Concrete strengths outside this range are refused (MPa): a unit mistake.
    pub fc_mpa: (f64, f64),
    /// Steel strengths outside this range are refused (MPa): a unit mistake.
    pub fy_mpa: (f64, f64),
    /// Years outside this range are refused.
    pub year: (i32, i32),
    /// Listed walls and `rc_wall_area_*` further apart than this (%) give a warning.
    pub wall_area_mismatch_pct: f64,
    /// Storey heights outside this range are refused (m): a unit mistake.
    pub storey_height_error_m: (f64, f64),
    /// Wall thicknesses outside this range are refused (m): a unit mistake.
    pub wall_thickness_m: (f64, f64),
    /// Column depths outside this range are refused (m): a unit mistake.
    pub column_depth_m: (f64, f64),
    /// Wall lengths outside this range are refused (m): a unit mistake.
    pub wall_length_m: (f64, f64),
    /// agR above this is refused (g): it looks like m/s².
    pub agr_max_g: f64,
    /// Floor weights outside this range are refused (kPa): a unit mistake.
    pub floor_weight_error_kpa: (f64, f64),
}

/// inventory.md "Errors that catch unit mistakes": storey heights 1.5–12 m.
pub const UNIT_MISTAKE_STOREY_HEIGHT_M: (f64, f64) = (1.5, 12.0);
/// inventory.md: wall thickness 0.05–1.5 m.
pub const UNIT_MISTAKE_WALL_THICKNESS_M: (f64, f64) = (0.05, 1.5);
/// inventory.md: column depth 0.1–3 m.
pub const UNIT_MISTAKE_COLUMN_DEPTH_M: (f64, f64) = (0.1, 3.0);
/// inventory.md: wall length 0.3–100 m.
pub const UNIT_MISTAKE_WALL_LENGTH_M: (f64, f64) = (0.3, 100.0);
/// inventory.md: agr_g above 1.5 g looks like m/s².
pub const UNIT_MISTAKE_AGR_MAX_G: f64 = 1.5;
/// inventory.md: floor weight 2–40 kPa.
pub const UNIT_MISTAKE_FLOOR_WEIGHT_KPA: (f64, f64) = (2.0, 40.0);

/// Units a length in metres was probably typed in, with the divisor to metres.
const LENGTH_SLIPS: &[(&str, f64, f64)] = &[("mm", 1.0, 1000.0), ("cm", 1.0, 100.0)];
/// Units a floor weight in kPa was probably typed in (kg/m² × 9.81/1000; Pa ÷ 1000; MPa
/// × 1000).
const WEIGHT_SLIPS: &[(&str, f64, f64)] = &[
    ("kg/m² (a mass, not a weight)", 9.81, 1000.0),
    ("Pa", 1.0, 1000.0),
    ("MPa", 1000.0, 1.0),
];
/// agR typed in m/s² (÷ 9.81).
const AGR_SLIPS: &[(&str, f64, f64)] = &[("m/s²", 1.0, crate::input::columns::G_M_S2)];

/// A check that a value lies in `lo..=hi` (of `unit`), naming the likely unit when the
/// value fits once converted from one of `slips` (unit, multiplier, divisor).
pub fn unit_mistake_check(
    what: &'static str,
    unit: &'static str,
    (lo, hi): (f64, f64),
    slips: &'static [(&'static str, f64, f64)],
) -> impl Fn(f64) -> Result<(), String> {
    move |v: f64| {
        if v >= lo && v <= hi {
            return Ok(());
        }
        let f = format_number;
        let mut msg = format!(
            "expected {what} from {} to {} {unit}, found {} {unit}",
            f(lo),
            f(hi),
            f(value_round(v))
        );
        if let Some((slip, mul, div)) = slips
            .iter()
            .find(|(_, mul, div)| (lo..=hi).contains(&(v * mul / div)))
        {
            msg.push_str(&format!(
                ": it looks like {slip} ({} {unit}); write the value in {unit}, or name its unit in the header (e.g. \"({})\")",
                f(value_round(v * mul / div)),
                slip.split(' ').next().unwrap_or(slip)
            ));
        } else {
            msg.push_str(": a unit mistake?");
        }
        Err(msg)
    }
}

/// The agR check: not negative, and at most `max` g (above it the hint gives the value ÷
/// 9.81: it looks like m/s²).
pub fn agr_check(max: f64) -> impl Fn(f64) -> Result<(), String> {
    let upper = unit_mistake_check(
        "a reference peak ground acceleration agR",
        "g",
        (0.0, max),
        AGR_SLIPS,
    );
    move |v: f64| {
        non_negative_check(v)?;
        upper(v)
    }
}

fn positive_check(v: f64) -> Result<(), String> {
    if v > 0.0 {
        Ok(())
    } else {
        Err(format!(
            "expected a number greater than 0, found {}",
            format_number(v)
        ))
    }
}

fn non_negative_check(v: f64) -> Result<(), String> {
    if v >= 0.0 {
        Ok(())
    } else {
        Err(format!(
            "expected a number of at least 0, found {}",
            format_number(v)
        ))
    }
}

/// The whole number a value stands for (a formula result such as 2.9999999999999996 is
/// the 3 a person sees); `None` when it is not whole.
fn whole_of(v: f64) -> Option<i64> {
    let r = v.round();
    let v = if (v - r).abs() <= 1e-9 * r.abs().max(1.0) {
        r
    } else {
        v
    };
    (v.fract() == 0.0 && v.abs() <= 1e12).then_some(v as i64)
}

impl Limits {
    /// The limits of effective settings (the unit-mistake ranges of inventory.md are
    /// fixed: they catch a value typed in the wrong unit, not a rare building): the settings keys `max_storeys`,
    /// `storey_height_min_m`/`_max_m`, `floor_weight_min_kpa`/`_max_kpa` and
    /// `wall_area_mismatch_pct`. The fc, fy and year ranges are not settings keys: they
    /// catch unit and typing mistakes (inventory.md, "Bad input": fc 5–120 MPa, fy 150–700
    /// MPa) and stay fixed.
    pub fn from_settings(s: &crate::settings::Settings) -> Self {
        Self {
            max_storeys: s.max_storeys,
            storey_height_m: (s.storey_height_min_m, s.storey_height_max_m),
            floor_weight_kpa: (s.floor_weight_min_kpa, s.floor_weight_max_kpa),
            fc_mpa: (5.0, 120.0),
            fy_mpa: (150.0, 700.0),
            year: (1000, 2200),
            wall_area_mismatch_pct: s.wall_area_mismatch_pct,
            storey_height_error_m: UNIT_MISTAKE_STOREY_HEIGHT_M,
            wall_thickness_m: UNIT_MISTAKE_WALL_THICKNESS_M,
            column_depth_m: UNIT_MISTAKE_COLUMN_DEPTH_M,
            wall_length_m: UNIT_MISTAKE_WALL_LENGTH_M,
            agr_max_g: UNIT_MISTAKE_AGR_MAX_G,
            floor_weight_error_kpa: UNIT_MISTAKE_FLOOR_WEIGHT_KPA,
        }
    }
}

impl Default for Limits {
    /// The limits of the built-in default settings.
    fn default() -> Self {
        Self::from_settings(&crate::settings::Settings::default())
    }
}

/// Reads the cells of one data row by canonical column name, collecting problems.
pub struct RowParser<'a> {
    spec: &'static SheetSpec,
    /// Spreadsheet row.
    pub row: usize,
    cells: &'a [RawCell],
    scale: &'a [super::columns::Factor],
    decimal_comma: bool,
    hint: std::cell::Cell<usize>,
    /// Problems of this row (errors and warnings).
    pub problems: Vec<Problem>,
}

fn shorten(s: &str) -> String {
    let t = s.trim();
    if t.chars().count() > 40 {
        format!("{}…", t.chars().take(40).collect::<String>())
    } else {
        t.to_string()
    }
}

/// How a cell is described in messages ("found …").
pub fn describe(cell: &RawCell) -> String {
    match cell {
        RawCell::Empty => "a blank cell".into(),
        RawCell::Text(t) => format!("the text \"{}\"", shorten(t)),
        RawCell::Number(v) => format_number(*v),
        RawCell::Bool(b) => format!("the logical value {}", if *b { "TRUE" } else { "FALSE" }),
        RawCell::Date { serial, is_1904 } => match year_of_serial(*serial, *is_1904) {
            Some(y) => format!("a date in {y}"),
            None => "a date".into(),
        },
        RawCell::DateIso(t) => format!("the date {}", shorten(t)),
        RawCell::Error(e) => format!("the error cell {e}"),
        RawCell::FormulaNoValue(f) => format!(
            "a formula without a cached value (={}); open and save the file in a spreadsheet program that calculates it",
            shorten(f)
        ),
    }
}

/// A number read from survey text ([`survey_number`]).
#[derive(Debug, Clone, PartialEq)]
pub struct SurveyNumber {
    /// The reading used (for an ambiguous "1,200": the decimal-comma reading 1.2).
    pub value: f64,
    /// The other reading of an ambiguous "1,200" (thousands separator: 1200).
    pub alternative: Option<f64>,
    /// What was done to read the text, for the warning (empty for a plain number).
    pub notes: Vec<String>,
    /// A unit written after the number, as written.
    pub unit: Option<String>,
}

fn is_group_space(c: char) -> bool {
    matches!(
        c,
        ' ' | '\u{a0}' | '\u{202f}' | '\u{2009}' | '\u{2007}' | '\'' | '\u{2019}'
    )
}

fn digits(s: &str) -> bool {
    !s.is_empty() && s.bytes().all(|b| b.is_ascii_digit())
}

/// Whether `int` is digits grouped in threes by `sep` ("1,200,000"): a first group of one
/// to three digits not starting with 0, then groups of exactly three.
fn grouped_in_threes(int: &str, sep: char) -> bool {
    let mut parts = int.split(sep);
    let Some(first) = parts.next() else {
        return false;
    };
    let first_ok = digits(first) && first.len() <= 3 && !first.starts_with('0');
    let mut any = false;
    for p in parts {
        any = true;
        if !(digits(p) && p.len() == 3) {
            return false;
        }
    }
    first_ok && any
}

const CIRCA: [&str; 7] = ["circa", "approx.", "approx", "ca.", "ca", "c.", "~"];

/// Reads a number written the way surveys write them (inventory.md, "Survey text in a
/// numeric cell"), with a note for each thing done:
/// - a decimal comma ("3,2");
/// - digits grouped in threes by spaces (also non-breaking or thin spaces) or apostrophes
///   ("1 200", "1'200");
/// - both separators ("1.200,5", "1,200.5"): the last one is the decimal mark;
/// - a unit after the number ("20 MPa", "3.1 m"), returned as written for the caller to
///   check against the column's unit;
/// - with `circa`, a circa year ("c. 1960", "ca 1960", "~1960").
///
/// A period alone is always the decimal mark. A lone comma followed by exactly three digits
/// ("1,200") is ambiguous: `value` is the decimal reading and `alternative` the thousands
/// reading, for the caller to put both through the column's checks. `decimal_comma` (a
/// `;`-separated CSV file) makes the comma the file's decimal mark: read without a note and
/// never ambiguous. `Err` says what to do.
pub fn survey_number(text: &str, decimal_comma: bool, circa: bool) -> Result<SurveyNumber, String> {
    let mut notes = Vec::new();
    let mut t = text.trim();
    if circa {
        let lower = t.to_lowercase();
        if let Some(prefix) = CIRCA.iter().find(|p| lower.starts_with(*p)) {
            let rest = t.get(prefix.len()..).unwrap_or("").trim_start();
            if rest.starts_with(|c: char| c.is_ascii_digit()) {
                notes.push(format!(
                    "the circa year \"{}\" is read as the year",
                    text.trim()
                ));
                t = rest;
            }
        }
    }
    // Split the number from a unit written after it.
    let chars: Vec<(usize, char)> = t.char_indices().collect();
    let mut end = t.len();
    for (k, (i, c)) in chars.iter().enumerate() {
        let next = chars.get(k + 1).map(|(_, c)| *c);
        let numeric = c.is_ascii_digit()
            || matches!(c, '.' | ',' | '+' | '-')
            || is_group_space(*c)
            || (matches!(c, 'e' | 'E')
                && k > 0
                && next.is_some_and(|n| n.is_ascii_digit() || n == '-' || n == '+'));
        if !numeric {
            end = *i;
            break;
        }
    }
    let (num, unit) = t.split_at(end);
    let num = num.trim_end();
    let unit = unit.trim();
    let unit = (!unit.is_empty()).then(|| unit.to_string());
    if num.is_empty() {
        return Err("expected a number".into());
    }
    let (sign, body) = match num.strip_prefix('-') {
        Some(b) => ("-", b),
        None => ("", num.strip_prefix('+').unwrap_or(num)),
    };
    // Grouping by spaces or apostrophes.
    let mut grouped = false;
    let body: String = if body.contains(is_group_space) {
        let int_end = body.find(['.', ',']).unwrap_or(body.len());
        let (int, rest) = body.split_at(int_end);
        if rest.contains(is_group_space) || int.contains("  ") {
            return Err("expected digits grouped in threes before the decimal mark; write the number without separators and use a decimal point".into());
        }
        let int_n: String = int
            .chars()
            .map(|c| if is_group_space(c) { ' ' } else { c })
            .collect();
        if !grouped_in_threes(&int_n, ' ') {
            return Err("expected digits grouped in threes (\"1 200\"); write the number without separators".into());
        }
        grouped = true;
        notes.push("the digit grouping (spaces or apostrophes) is removed".into());
        format!("{}{rest}", int_n.replace(' ', ""))
    } else {
        body.to_string()
    };
    let commas = body.matches(',').count();
    let periods = body.matches('.').count();
    let mut alternative = None;
    let plain: String = if commas > 0 && periods > 0 {
        let last_comma = body.rfind(',').unwrap_or(0);
        let last_period = body.rfind('.').unwrap_or(0);
        let (dec, group) = if last_comma > last_period {
            (',', '.')
        } else {
            ('.', ',')
        };
        let (int, frac) = body.split_at(if dec == ',' { last_comma } else { last_period });
        let frac = &frac[1..];
        if grouped || !grouped_in_threes(int, group) || !digits(frac) {
            return Err("expected one decimal mark and digits grouped in threes; write the number without thousands separators and use a decimal point".into());
        }
        notes.push(format!(
            "both separators: \"{dec}\" is read as the decimal mark and \"{group}\" as the thousands separator"
        ));
        format!("{}.{frac}", int.replace(group, ""))
    } else if commas == 1 {
        let (int, frac) = body.split_once(',').unwrap_or((&body, ""));
        if !digits(frac) || !(digits(int) || int.is_empty()) {
            return Err("expected a number; use a decimal point".into());
        }
        let decimal = format!("{int}.{frac}");
        if decimal_comma || grouped {
            decimal
        } else {
            if frac.len() == 3 && grouped_in_threes(&format!("{int},{frac}"), ',') {
                alternative = Some(format!("{sign}{int}{frac}"));
            } else {
                notes.push(
                    "the decimal comma is read as a decimal point (use a decimal point)".into(),
                );
            }
            decimal
        }
    } else if commas > 1 {
        if decimal_comma || grouped || !grouped_in_threes(&body, ',') {
            return Err("expected one decimal mark; write the number without thousands separators and use a decimal point".into());
        }
        notes.push("the commas are read as thousands separators".into());
        body.replace(',', "")
    } else if periods > 1 {
        return Err("expected one decimal point, found several (a period is always the decimal mark); write the number without thousands separators".into());
    } else {
        body
    };
    let parse = |s: &str| -> Option<f64> {
        if s.is_empty()
            || !s
                .bytes()
                .all(|b| b.is_ascii_digit() || matches!(b, b'.' | b'-' | b'e' | b'E' | b'+'))
        {
            return None;
        }
        let v: f64 = s.parse().ok()?;
        v.is_finite().then_some(v)
    };
    let value = parse(&format!("{sign}{plain}")).ok_or_else(|| "expected a number".to_string())?;
    let alternative = match alternative {
        Some(a) => Some(parse(&a).ok_or_else(|| "expected a number".to_string())?),
        None => None,
    };
    Ok(SurveyNumber {
        value,
        alternative,
        notes,
        unit,
    })
}

/// Reads a plain number from text (`12.5`, `-3`, `1e3`; `12,5` when decimal commas are
/// allowed): [`survey_number`] without a unit, circa or ambiguity.
pub fn parse_number_text(text: &str, decimal_comma: bool) -> Option<f64> {
    let n = survey_number(text, decimal_comma, false).ok()?;
    (n.unit.is_none() && n.alternative.is_none() && (decimal_comma || n.notes.is_empty()))
        .then_some(n.value)
}

/// The outcome of checking the readings of one cell against a column's checks.
#[derive(Debug, Clone, PartialEq)]
pub enum Checked {
    /// The value used, and the warning to give (None: read as is).
    Value(f64, Option<String>),
    /// The cell is refused: the error message.
    Refused(String),
}

/// Reads a survey-text cell for a column: parses it ([`survey_number`]), converts a unit
/// written after the number to the column's unit (`canonical`; `scale` is the header
/// unit's factor, used when the cell names no unit), then puts each reading through
/// `check` (an ambiguous "1,200": one reading passes → used with a warning; both pass →
/// refused, showing both). The one function behind both the inventory's cells and the
/// settings (sheet and file).
pub fn read_survey_text(
    text: &str,
    decimal_comma: bool,
    circa: bool,
    column: &str,
    canonical: Option<&'static super::columns::Unit>,
    scale: super::columns::Factor,
    check: &dyn Fn(f64) -> Result<(), String>,
) -> Checked {
    let shown = shorten(text);
    let n = match survey_number(text, decimal_comma, circa) {
        Ok(n) => n,
        Err(e) if e == "expected a number" => {
            return Checked::Refused(format!(
                "{e}, found the text \"{shown}\"; write the number alone (digits, with a decimal point)"
            ));
        }
        Err(e) => return Checked::Refused(format!("{e} (found the text \"{shown}\")")),
    };
    let mut notes = n.notes.clone();
    let factor = match &n.unit {
        None => scale,
        Some(u) => match super::header::unit_factor(canonical, column, u) {
            Err(e) => {
                return Checked::Refused(format!(
                    "{e}; found \"{shown}\": write the number without its unit"
                ));
            }
            Ok(None) => {
                notes.push(format!("the unit \"{u}\" after the number is removed"));
                super::columns::Factor::ONE
            }
            Ok(Some((f, unit))) => {
                let to = canonical.map_or("", |c| c.label);
                notes.push(format!(
                    "the value in {} is converted to {to} ({})",
                    unit.label,
                    super::header::factor_text(f)
                ));
                f
            }
        },
    };
    let value = factor.apply(n.value);
    // A header conversion is warned on the header row; a refused value names it too.
    let header_note = (n.unit.is_none() && scale != super::columns::Factor::ONE).then(|| {
        format!(
            "written {}, converted from the header's unit: {}",
            format_number(n.value),
            super::header::factor_text(scale)
        )
    });
    let note = |notes: &[String]| {
        (!notes.is_empty()).then(|| {
            format!(
                "read \"{shown}\" as {}: {}",
                format_number(value_round(value)),
                notes.join("; ")
            )
        })
    };
    match n.alternative.map(|a| factor.apply(a)) {
        None => match check(value) {
            Ok(()) => Checked::Value(value, note(&notes)),
            Err(e) => {
                let mut all = notes.clone();
                all.extend(header_note);
                Checked::Refused(if all.is_empty() {
                    e
                } else {
                    format!("{e} (read from \"{shown}\": {})", all.join("; "))
                })
            }
        },
        Some(alt) => {
            let (a, b) = (check(value), check(alt));
            let (va, vb) = (
                format_number(value_round(value)),
                format_number(value_round(alt)),
            );
            match (a, b) {
                (Ok(()), Ok(())) => Checked::Refused(format!(
                    "\"{shown}\" is ambiguous: {va} (decimal comma) or {vb} (thousands separator), both plausible; write {va} or {vb} without the comma"
                )),
                (Ok(()), Err(e)) => Checked::Value(
                    value,
                    Some(format!(
                        "read \"{shown}\" as {va} (decimal comma): the other reading, {vb}, is refused ({e}); use a decimal point"
                    )),
                ),
                (Err(e), Ok(())) => Checked::Value(
                    alt,
                    Some(format!(
                        "read \"{shown}\" as {vb} (thousands separator): the other reading, {va}, is refused ({e}); write the number without the comma"
                    )),
                ),
                (Err(ea), Err(eb)) => Checked::Refused(format!(
                    "\"{shown}\" reads as {va} (decimal comma): {ea}; or as {vb} (thousands separator): {eb}"
                )),
            }
        }
    }
}

/// A converted value without the float noise of the conversion (250 mm × 0.001 shows as
/// 0.25, not 0.25000000000000006), for messages only.
fn value_round(v: f64) -> f64 {
    if v == 0.0 || !v.is_finite() {
        return v;
    }
    let s = format!("{v:.12e}");
    s.parse().unwrap_or(v)
}

impl<'a> RowParser<'a> {
    /// A parser over one data row.
    pub fn new(spec: &'static SheetSpec, row: &'a DataRow, decimal_comma: bool) -> Self {
        Self {
            spec,
            row: row.row,
            cells: &row.cells,
            scale: &row.scale,
            decimal_comma,
            hint: std::cell::Cell::new(0),
            problems: Vec::new(),
        }
    }

    /// Whether any error was recorded.
    pub fn has_errors(&self) -> bool {
        self.problems.iter().any(|p| p.severity == Severity::Error)
    }

    fn position(&self, name: &str) -> Option<usize> {
        // Columns are mostly read in table order: search from the last hit onwards.
        let cols = self.spec.columns;
        let n = cols.len();
        let start = self.hint.get();
        for k in 0..n {
            let i = (start + k) % n;
            if cols.get(i).is_some_and(|c| c.name == name) {
                self.hint.set(i);
                return Some(i);
            }
        }
        None
    }

    fn cell(&self, name: &str) -> &'a RawCell {
        const EMPTY: &RawCell = &RawCell::Empty;
        let cells: &'a [RawCell] = self.cells;
        self.position(name)
            .and_then(|i| cells.get(i))
            .unwrap_or(EMPTY)
    }

    /// Records a problem in a column.
    pub fn push(&mut self, column: &str, message: String, severity: Severity) {
        self.problems.push(Problem {
            sheet: self.spec.name.to_string(),
            row: Some(self.row),
            column: column.to_string(),
            message,
            severity,
        });
    }

    /// Records an error in a column.
    pub fn error(&mut self, column: &str, message: String) {
        self.push(column, message, Severity::Error);
    }

    /// Records a warning in a column.
    pub fn warn(&mut self, column: &str, message: String) {
        self.push(column, message, Severity::Warning);
    }

    /// What to do about a bad optional cell: "leave it blank for the default …".
    fn blank_hint(&self, name: &str) -> String {
        match self.spec.column(name) {
            Some(c) if !c.required && c.default != "—" && !c.default.starts_with("— ") => {
                format!("; leave it blank for the default, {}", c.default)
            }
            Some(c) if !c.required => "; leave it blank if it is not known".into(),
            _ => String::new(),
        }
    }

    /// Records a cell error with what to do about it.
    fn cell_error(&mut self, name: &str, message: String) {
        let hint = self.blank_hint(name);
        self.error(name, format!("{message}{hint}"));
    }

    fn unreadable(&mut self, name: &str, expected: &str) {
        let found = describe(self.cell(name));
        self.cell_error(name, format!("expected {expected}, found {found}"));
    }

    /// A number put through `check` (the column's error checks, on the value in the
    /// column's unit): a number cell, or survey text read by [`read_survey_text`] (a header
    /// unit converted, a unit in the cell converted or refused, each reading of an
    /// ambiguous "1,200" checked). `None` when blank or refused (then an error is recorded).
    pub fn checked(
        &mut self,
        name: &str,
        check: &dyn Fn(f64) -> Result<(), String>,
    ) -> Option<f64> {
        let i = self.position(name);
        let scale = i
            .and_then(|i| self.scale.get(i))
            .copied()
            .unwrap_or(super::columns::Factor::ONE);
        let canonical = i
            .and_then(|i| self.spec.columns.get(i))
            .and_then(super::columns::canonical_unit);
        match self.cell(name) {
            RawCell::Empty => None,
            RawCell::Number(raw) if raw.is_finite() => {
                let v = scale.apply(*raw);
                match check(v) {
                    Ok(()) => Some(v),
                    Err(e) if scale != super::columns::Factor::ONE => {
                        let how = super::header::factor_text(scale);
                        self.cell_error(
                            name,
                            format!(
                                "{e} (written {}, converted from the header's unit: {how})",
                                format_number(*raw)
                            ),
                        );
                        None
                    }
                    Err(e) => {
                        self.cell_error(name, e);
                        None
                    }
                }
            }
            RawCell::Text(t) => {
                match read_survey_text(t, self.decimal_comma, false, name, canonical, scale, check)
                {
                    Checked::Value(v, note) => {
                        if let Some(n) = note {
                            self.warn(name, n);
                        }
                        Some(v)
                    }
                    Checked::Refused(e) => {
                        self.cell_error(name, e);
                        None
                    }
                }
            }
            _ => {
                self.unreadable(name, "a number");
                None
            }
        }
    }

    /// A number; `None` when blank or unreadable (then an error is recorded).
    pub fn number(&mut self, name: &str) -> Option<f64> {
        self.checked(name, &|_| Ok(()))
    }

    fn require(&mut self, name: &str, what: &str) -> bool {
        if self.cell(name).is_blank() {
            self.error(
                name,
                format!("expected {what} (required), found a blank cell"),
            );
            return false;
        }
        true
    }

    /// A required number; an error when blank.
    pub fn required_number(&mut self, name: &str) -> Option<f64> {
        if !self.require(name, "a number") {
            return None;
        }
        self.number(name)
    }

    /// A whole number (12.0 is 12; 2.5 is an error).
    pub fn whole(&mut self, name: &str, required: bool) -> Option<i64> {
        self.whole_in(name, required, &|_| Ok(()))
    }

    /// A whole number that also passes `check`.
    pub fn whole_in(
        &mut self,
        name: &str,
        required: bool,
        check: &dyn Fn(i64) -> Result<(), String>,
    ) -> Option<i64> {
        if required && !self.require(name, "a whole number") {
            return None;
        }
        let v = self.checked(name, &|v| {
            let n = whole_of(v)
                .ok_or_else(|| format!("expected a whole number, found {}", format_number(v)))?;
            check(n)
        })?;
        whole_of(v)
    }

    /// A number that must be > 0 (when given).
    pub fn positive(&mut self, name: &str) -> Option<f64> {
        self.checked(name, &positive_check)
    }

    /// A number that must be ≥ 0 (when given).
    pub fn non_negative(&mut self, name: &str) -> Option<f64> {
        self.checked(name, &non_negative_check)
    }

    /// Text (trimmed); numbers as a person typed them.
    pub fn text(&mut self, name: &str) -> Option<String> {
        match self.cell(name) {
            RawCell::Empty => None,
            RawCell::Text(t) => {
                let t = t.trim();
                (!t.is_empty()).then(|| t.to_string())
            }
            RawCell::Number(v) => Some(format_number(*v)),
            RawCell::Bool(b) => Some(if *b { "TRUE" } else { "FALSE" }.to_string()),
            RawCell::DateIso(t) => Some(t.clone()),
            RawCell::Date { serial, .. } => Some(format_number(*serial)),
            RawCell::Error(_) | RawCell::FormulaNoValue(_) => {
                self.unreadable(name, "a text");
                None
            }
        }
    }

    /// A required identifier.
    pub fn id(&mut self, name: &str) -> Option<String> {
        if self.cell(name).is_blank() {
            self.error(name, "expected an id (required), found a blank cell".into());
            return None;
        }
        self.text(name)
    }

    /// A year: a bare number is a year; a date cell gives its year with a warning.
    pub fn year(&mut self, name: &str, limits: &Limits) -> Option<i32> {
        let cell = self.cell(name);
        let (lo, hi) = limits.year;
        let in_range = |y: f64| y.fract() == 0.0 && y >= f64::from(lo) && y <= f64::from(hi);
        let year = match cell {
            RawCell::Empty => return None,
            RawCell::Number(v) if in_range(*v) => *v as i32,
            RawCell::Date { serial, is_1904 } => {
                if in_range(*serial) {
                    let y = *serial as i32;
                    self.warn(
                        name,
                        format!("expected a year, found a date-formatted cell holding {y}; read as the year {y}"),
                    );
                    y
                } else if let Some(y) = year_of_serial(*serial, *is_1904) {
                    self.warn(
                        name,
                        format!("expected a year, found a date; its year {y} is used"),
                    );
                    y
                } else {
                    self.unreadable(name, "a year");
                    return None;
                }
            }
            RawCell::DateIso(t) => match t.get(..4).and_then(|y| y.parse::<i32>().ok()) {
                Some(y) => {
                    self.warn(
                        name,
                        format!("expected a year, found the date {t}; its year {y} is used"),
                    );
                    y
                }
                None => {
                    self.unreadable(name, "a year");
                    return None;
                }
            },
            RawCell::Text(t) => {
                let t = t.trim();
                // "1,960": of the two readings only the thousands one is a year.
                let survey = survey_number(t, false, true).ok().and_then(|mut n| {
                    if let Some(a) = n.alternative.take() {
                        if in_range(n.value) || !in_range(a) {
                            return None;
                        }
                        n.notes.push(format!(
                            "the comma is read as a thousands separator ({} is not a year)",
                            format_number(n.value)
                        ));
                        n.value = a;
                    }
                    (n.unit.is_none() && in_range(n.value)).then_some(n)
                });
                if let Some(n) = survey {
                    if !n.notes.is_empty() {
                        self.warn(
                            name,
                            format!(
                                "read \"{}\" as {}: {}",
                                shorten(t),
                                n.value,
                                n.notes.join("; ")
                            ),
                        );
                    }
                    n.value as i32
                } else if let Some(y) = date_text_year(t) {
                    self.warn(
                        name,
                        format!("expected a year, found the date \"{t}\"; its year {y} is used"),
                    );
                    y
                } else {
                    self.unreadable(name, &format!("a year ({lo}–{hi})"));
                    return None;
                }
            }
            _ => {
                self.unreadable(name, &format!("a year ({lo}–{hi})"));
                return None;
            }
        };
        if year < lo || year > hi {
            self.error(name, format!("expected a year ({lo}–{hi}), found {year}"));
            return None;
        }
        Some(year)
    }

    fn keyword(&mut self, name: &str, expected: &str) -> Option<String> {
        match self.cell(name) {
            RawCell::Empty => None,
            RawCell::Text(t) if !t.trim().is_empty() => Some(t.trim().to_ascii_lowercase()),
            RawCell::Bool(b) => Some(if *b { "yes" } else { "no" }.to_string()),
            _ => {
                self.unreadable(name, expected);
                None
            }
        }
    }

    /// Building use.
    pub fn use_(&mut self, name: &str) -> Option<Use> {
        const EXP: &str = "one of residential, school, hospital, office, other";
        let k = self.keyword(name, EXP)?;
        let v = Use::ALL.into_iter().find(|u| u.code() == k);
        if v.is_none() {
            self.unreadable(name, EXP);
        }
        v
    }

    /// yes / no / unknown.
    pub fn yes_no(&mut self, name: &str) -> Option<YesNo> {
        const EXP: &str = "yes, no or unknown";
        let k = self.keyword(name, EXP)?;
        let v = match k.as_str() {
            "yes" | "y" | "true" => Some(YesNo::Yes),
            "no" | "n" | "false" => Some(YesNo::No),
            "unknown" | "?" | "u" => Some(YesNo::Unknown),
            _ => None,
        };
        if v.is_none() {
            self.unreadable(name, EXP);
        }
        v
    }

    /// Ground type A–E.
    pub fn ground(&mut self, name: &str) -> Option<GroundType> {
        const EXP: &str = "a ground type A, B, C, D or E";
        let k = self.keyword(name, EXP)?;
        let v = match k.as_str() {
            "a" => Some(GroundType::A),
            "b" => Some(GroundType::B),
            "c" => Some(GroundType::C),
            "d" => Some(GroundType::D),
            "e" => Some(GroundType::E),
            _ => None,
        };
        if v.is_none() {
            self.unreadable(name, EXP);
        }
        v
    }

    /// Direction X / Y.
    pub fn direction(&mut self, name: &str) -> Option<Dir> {
        const EXP: &str = "a direction X or Y";
        let k = self.keyword(name, EXP)?;
        let v = match k.as_str() {
            "x" => Some(Dir::X),
            "y" => Some(Dir::Y),
            _ => None,
        };
        if v.is_none() {
            self.unreadable(name, EXP);
        }
        v
    }
}

/// The year of a date written as text (`1972-05-01`, `01/05/1972`, `1.5.1972`).
fn date_text_year(t: &str) -> Option<i32> {
    let parts: Vec<&str> = t.split(['-', '/', '.']).collect();
    if parts.len() != 3
        || !parts
            .iter()
            .all(|p| !p.is_empty() && p.bytes().all(|b| b.is_ascii_digit()))
    {
        return None;
    }
    let first = parts.first()?;
    let last = parts.last()?;
    let y = if first.len() == 4 {
        first
    } else if last.len() == 4 {
        last
    } else {
        return None;
    };
    y.parse().ok()
}

/// Latitude and longitude: each within ±90 / ±180, else an error on the row that says when
/// they look swapped (swapping them gives valid values). inventory.md, "Coordinates".
fn coordinates(p: &mut RowParser<'_>, b: &mut BuildingRecord) {
    // Each reading of an ambiguous "40,500" must at least be a longitude (|v| ≤ 180) to be
    // taken; the latitude range and the swap are judged below, on both values together.
    let degrees = |v: f64| {
        if (-180.0..=180.0).contains(&v) {
            Ok(())
        } else {
            Err(format!(
                "expected decimal degrees between -180 and 180, found {}",
                format_number(v)
            ))
        }
    };
    let lat = p.checked("latitude", &degrees);
    let lon = p.checked("longitude", &degrees);
    let lat_ok = lat.is_none_or(|v| (-90.0..=90.0).contains(&v));
    let lon_ok = lon.is_none_or(|v| (-180.0..=180.0).contains(&v));
    if !(lat_ok && lon_ok) {
        let swapped = matches!((lat, lon), (Some(a), Some(o)) if (-90.0..=90.0).contains(&o) && (-180.0..=180.0).contains(&a));
        let hint = if swapped {
            "; latitude and longitude look swapped: swapping them gives valid values (put the north-south degrees in latitude)"
        } else {
            ""
        };
        if let (Some(v), false) = (lat, lat_ok) {
            p.error(
                "latitude",
                format!(
                    "expected decimal degrees between -90 and 90, found {}{hint}",
                    format_number(v)
                ),
            );
        }
        if let (Some(v), false) = (lon, lon_ok) {
            p.error(
                "longitude",
                format!(
                    "expected decimal degrees between -180 and 180, found {}{hint}",
                    format_number(v)
                ),
            );
        }
        return;
    }
    b.latitude = lat;
    b.longitude = lon;
    if b.latitude.is_some() != b.longitude.is_some() && !p.has_errors() {
        p.warn(
            if b.latitude.is_some() {
                "longitude"
            } else {
                "latitude"
            },
            "expected both latitude and longitude, found only one; the coordinates are ignored"
                .into(),
        );
        b.latitude = None;
        b.longitude = None;
    }
}

/// A storey height (buildings row or storeys sheet): refused outside the unit-mistake
/// range, a warning outside the unusual range.
fn storey_height(p: &mut RowParser<'_>, name: &str, limits: &Limits) -> Option<f64> {
    let v = p.checked(
        name,
        &unit_mistake_check(
            "a storey height",
            "m",
            limits.storey_height_error_m,
            LENGTH_SLIPS,
        ),
    )?;
    let (lo, hi) = limits.storey_height_m;
    if v < lo || v > hi {
        p.warn(name, format!("expected a storey height from {} to {} m, found {} m (unusual but possible; used as given)", format_number(lo), format_number(hi), format_number(value_round(v))));
    }
    Some(v)
}

/// Reads one row of the `buildings` sheet. Problems are returned with the record; the
/// caller rejects the row when any of them is an error.
pub fn building(
    row: &DataRow,
    decimal_comma: bool,
    limits: &Limits,
) -> (BuildingRecord, Vec<Problem>) {
    let mut p = RowParser::new(&BUILDINGS, row, decimal_comma);
    let mut b = BuildingRecord {
        row: row.row,
        ..Default::default()
    };
    b.id = p.id("id").unwrap_or_default();
    b.name = p.text("name").unwrap_or_default();
    b.use_ = p.use_("use");
    b.year_built = p.year("year_built", limits);
    coordinates(&mut p, &mut b);
    b.district = p.text("district");
    let max_storeys = limits.max_storeys;
    if let Some(n) = p.whole_in("storeys", true, &|n| {
        if n < 1 || n as f64 > max_storeys {
            Err(format!(
                "expected a whole number from 1 to {}, found {n}",
                format_number(max_storeys)
            ))
        } else {
            Ok(())
        }
    }) {
        b.storeys = n as u32;
    }
    b.storey_height_m = storey_height(&mut p, "storey_height_m", limits);
    b.ground_storey_height_m = storey_height(&mut p, "ground_storey_height_m", limits);
    if p.require("plan_area_m2", "a number")
        && let Some(v) = p.positive("plan_area_m2")
    {
        b.plan_area_m2 = v;
    }
    b.plan_length_x_m = p.positive("plan_length_x_m");
    b.plan_length_y_m = p.positive("plan_length_y_m");
    if p.require("column_area_m2", "a number")
        && let Some(v) = p.non_negative("column_area_m2")
    {
        b.column_area_m2 = v;
    }
    b.column_depth_m = p.checked(
        "column_depth_m",
        &unit_mistake_check("a column depth", "m", limits.column_depth_m, LENGTH_SLIPS),
    );
    b.rc_wall_area_x_m2 = p.non_negative("rc_wall_area_x_m2");
    b.rc_wall_area_y_m2 = p.non_negative("rc_wall_area_y_m2");
    let wall_length = unit_mistake_check("a wall length", "m", limits.wall_length_m, LENGTH_SLIPS);
    b.wall_length_x_m = p.checked("wall_length_x_m", &wall_length);
    b.wall_length_y_m = p.checked("wall_length_y_m", &wall_length);
    b.wall_thickness_m = p.checked(
        "wall_thickness_m",
        &unit_mistake_check(
            "a wall thickness",
            "m",
            limits.wall_thickness_m,
            LENGTH_SLIPS,
        ),
    );
    b.infill_area_x_m2 = p.non_negative("infill_area_x_m2");
    b.infill_area_y_m2 = p.non_negative("infill_area_y_m2");
    b.upper_rc_wall_area_x_m2 = p.non_negative("upper_rc_wall_area_x_m2");
    b.upper_rc_wall_area_y_m2 = p.non_negative("upper_rc_wall_area_y_m2");
    b.upper_infill_area_x_m2 = p.non_negative("upper_infill_area_x_m2");
    b.upper_infill_area_y_m2 = p.non_negative("upper_infill_area_y_m2");
    b.upper_column_area_m2 = p.non_negative("upper_column_area_m2");
    if b.plan_area_m2 > 0.0 {
        let plan = b.plan_area_m2;
        let areas = [
            ("column_area_m2", Some(b.column_area_m2)),
            ("rc_wall_area_x_m2", b.rc_wall_area_x_m2),
            ("rc_wall_area_y_m2", b.rc_wall_area_y_m2),
            ("infill_area_x_m2", b.infill_area_x_m2),
            ("infill_area_y_m2", b.infill_area_y_m2),
            ("upper_rc_wall_area_x_m2", b.upper_rc_wall_area_x_m2),
            ("upper_rc_wall_area_y_m2", b.upper_rc_wall_area_y_m2),
            ("upper_infill_area_x_m2", b.upper_infill_area_x_m2),
            ("upper_infill_area_y_m2", b.upper_infill_area_y_m2),
            ("upper_column_area_m2", b.upper_column_area_m2),
        ];
        for (name, v) in areas {
            if let Some(v) = v.filter(|v| *v > plan) {
                p.error(
                    name,
                    format!(
                        "expected an area no larger than the plan area ({} m²), found {} m²",
                        format_number(plan),
                        format_number(value_round(v))
                    ),
                );
            }
        }
    }
    b.boundary_elements = p.yes_no("boundary_elements");
    b.short_columns = p.yes_no("short_columns");
    for (name, (lo, hi)) in [("fc_mpa", limits.fc_mpa), ("fy_mpa", limits.fy_mpa)] {
        let v = p.checked(name, &|v| {
            if v < lo || v > hi {
                Err(format!(
                    "expected {} to {} MPa, found {} (a unit mistake?)",
                    format_number(lo),
                    format_number(hi),
                    format_number(value_round(v))
                ))
            } else {
                Ok(())
            }
        });
        match name {
            "fc_mpa" => b.fc_mpa = v,
            _ => b.fy_mpa = v,
        }
    }
    b.floor_weight_kpa = p.checked(
        "floor_weight_kpa",
        &unit_mistake_check(
            "a floor weight",
            "kPa",
            limits.floor_weight_error_kpa,
            WEIGHT_SLIPS,
        ),
    );
    if let Some(v) = b.floor_weight_kpa {
        let (lo, hi) = limits.floor_weight_kpa;
        if v < lo || v > hi {
            p.warn("floor_weight_kpa", format!("expected a floor weight from {} to {} kPa, found {} kPa (unusual but possible; used as given)", format_number(lo), format_number(hi), format_number(value_round(v))));
        }
    }
    b.occupants = p
        .whole_in("occupants", false, &|n| {
            if n < 0 {
                Err(format!("expected a whole number of at least 0, found {n}"))
            } else {
                Ok(())
            }
        })
        .map(|n| n as u64);
    b.ground_type = p.ground("ground_type");
    b.agr_g = p.checked("agr_g", &agr_check(limits.agr_max_g));
    b.sds_g = p.non_negative("sds_g");
    b.sd1_g = p.non_negative("sd1_g");
    b.period_x_s = p.positive("period_x_s");
    b.period_y_s = p.positive("period_y_s");
    (b, p.problems)
}

fn storey_number(p: &mut RowParser<'_>, name: &str, required: bool) -> Option<u32> {
    let n = p.whole_in(name, required, &|n| {
        if (1..=1000).contains(&n) {
            Ok(())
        } else {
            Err(format!("expected a storey number of at least 1, found {n}"))
        }
    })?;
    Some(n as u32)
}

/// Reads one row of the `walls` sheet (lengths and thicknesses get the buildings sheet's
/// unit-mistake checks).
pub fn wall(row: &DataRow, decimal_comma: bool) -> (WallRecord, Vec<Problem>) {
    wall_with(row, decimal_comma, &Limits::default())
}

/// [`wall`] with given limits.
pub fn wall_with(
    row: &DataRow,
    decimal_comma: bool,
    limits: &Limits,
) -> (WallRecord, Vec<Problem>) {
    let mut p = RowParser::new(&WALLS, row, decimal_comma);
    let mut w = WallRecord {
        row: row.row,
        ..Default::default()
    };
    w.building_id = p.id("building_id").unwrap_or_default();
    w.wall_id = p.text("wall_id").unwrap_or_default();
    w.direction = p.direction("direction");
    if p.require("length_m", "a number")
        && let Some(v) = p.checked(
            "length_m",
            &unit_mistake_check("a wall length", "m", limits.wall_length_m, LENGTH_SLIPS),
        )
    {
        w.length_m = v;
    }
    w.thickness_m = p.checked(
        "thickness_m",
        &unit_mistake_check(
            "a wall thickness",
            "m",
            limits.wall_thickness_m,
            LENGTH_SLIPS,
        ),
    );
    w.x_m = p.number("x_m");
    w.y_m = p.number("y_m");
    w.boundary_elements = p.yes_no("boundary_elements");
    w.boundary_steel_pct = p.non_negative("boundary_steel_pct");
    w.web_steel_pct = p.non_negative("web_steel_pct");
    w.bar_diameter_mm = p.positive("bar_diameter_mm");
    w.start_storey = storey_number(&mut p, "start_storey", false);
    w.end_storey = storey_number(&mut p, "end_storey", false);
    if let (Some(s), Some(e)) = (w.start_storey, w.end_storey)
        && e < s
    {
        p.error(
            "end_storey",
            format!("expected an end storey at or above the start storey {s}, found {e}"),
        );
    }
    (w, p.problems)
}

/// Reads one row of the `storeys` sheet (heights get the buildings row's checks).
pub fn storey(row: &DataRow, decimal_comma: bool) -> (StoreyRecord, Vec<Problem>) {
    storey_with(row, decimal_comma, &Limits::default())
}

/// [`storey`] with given limits.
pub fn storey_with(
    row: &DataRow,
    decimal_comma: bool,
    limits: &Limits,
) -> (StoreyRecord, Vec<Problem>) {
    let mut p = RowParser::new(&STOREYS, row, decimal_comma);
    let mut s = StoreyRecord {
        row: row.row,
        ..Default::default()
    };
    s.building_id = p.id("building_id").unwrap_or_default();
    s.storey = storey_number(&mut p, "storey", true).unwrap_or(0);
    s.height_m = storey_height(&mut p, "height_m", limits);
    s.column_area_m2 = p.non_negative("column_area_m2");
    s.rc_wall_area_x_m2 = p.non_negative("rc_wall_area_x_m2");
    s.rc_wall_area_y_m2 = p.non_negative("rc_wall_area_y_m2");
    s.infill_area_x_m2 = p.non_negative("infill_area_x_m2");
    s.infill_area_y_m2 = p.non_negative("infill_area_y_m2");
    (s, p.problems)
}

/// Reads one row of the `eras` sheet (years as in year_built, strengths with the fc / fy
/// unit-mistake ranges).
pub fn era(
    row: &DataRow,
    decimal_comma: bool,
    limits: &Limits,
) -> (crate::settings::Era, Vec<Problem>) {
    let mut p = RowParser::new(&ERAS, row, decimal_comma);
    let from_year = p.year("from_year", limits);
    let to_year = p.year("to_year", limits);
    let mut strength = |name: &str, (lo, hi): (f64, f64)| {
        p.checked(name, &|v| {
            if v < lo || v > hi {
                Err(format!(
                    "expected {} to {} MPa, found {} (a unit mistake?)",
                    format_number(lo),
                    format_number(hi),
                    format_number(value_round(v))
                ))
            } else {
                Ok(())
            }
        })
    };
    let fc_mpa = strength("fc_mpa", limits.fc_mpa);
    let fy_mpa = strength("fy_mpa", limits.fy_mpa);
    if let (Some(a), Some(b)) = (from_year, to_year)
        && b < a
    {
        p.error(
            "to_year",
            format!("expected a last year at or after the first year {a}, found {b}"),
        );
    }
    (
        crate::settings::Era {
            from_year,
            to_year,
            fc_mpa,
            fy_mpa,
        },
        p.problems,
    )
}

/// Reads one row of the `footprints` sheet.
pub fn footprint(row: &DataRow, decimal_comma: bool) -> (FootprintVertex, Vec<Problem>) {
    let mut p = RowParser::new(&FOOTPRINTS, row, decimal_comma);
    let mut v = FootprintVertex {
        row: row.row,
        ..Default::default()
    };
    v.building_id = p.id("building_id").unwrap_or_default();
    v.vertex = p.required_number("vertex").unwrap_or_default();
    v.x_m = p.required_number("x_m").unwrap_or_default();
    v.y_m = p.required_number("y_m").unwrap_or_default();
    (v, p.problems)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sv(t: &str) -> Result<(f64, Option<f64>, usize, Option<String>), String> {
        survey_number(t, false, false).map(|n| (n.value, n.alternative, n.notes.len(), n.unit))
    }

    #[test]
    fn survey_numbers_of_inventory_md() {
        assert_eq!(sv("3,2"), Ok((3.2, None, 1, None)));
        assert_eq!(sv("1 200"), Ok((1200.0, None, 1, None)));
        assert_eq!(sv("1\u{a0}200"), Ok((1200.0, None, 1, None)));
        assert_eq!(sv("1\u{202f}200,5"), Ok((1200.5, None, 1, None)));
        assert_eq!(sv("1'200"), Ok((1200.0, None, 1, None)));
        assert_eq!(sv("1.200,5"), Ok((1200.5, None, 1, None)));
        assert_eq!(sv("1,200.5"), Ok((1200.5, None, 1, None)));
        assert_eq!(sv("1,200"), Ok((1.2, Some(1200.0), 0, None)));
        assert_eq!(sv("0,250"), Ok((0.25, None, 1, None)));
        assert_eq!(sv("1,200,000"), Ok((1_200_000.0, None, 1, None)));
        assert_eq!(sv("20 MPa"), Ok((20.0, None, 0, Some("MPa".into()))));
        assert_eq!(sv("3.1m"), Ok((3.1, None, 0, Some("m".into()))));
        assert_eq!(sv("1e3"), Ok((1000.0, None, 0, None)));
        assert_eq!(sv("-3,5"), Ok((-3.5, None, 1, None)));
        assert!(sv("1.200.000").is_err());
        assert!(sv("12 00").is_err());
        assert!(sv("1.2,3,4").is_err());
        assert!(sv("abc").is_err());
        assert!(sv("").is_err());
        let y = survey_number("c. 1960", false, true).unwrap();
        assert_eq!((y.value, y.notes.len()), (1960.0, 1));
        for t in ["ca 1960", "~1960", "ca. 1960", "circa 1960"] {
            assert_eq!(survey_number(t, false, true).unwrap().value, 1960.0, "{t}");
        }
        // A ;-separated CSV's decimal comma is the file's convention.
        assert_eq!(
            survey_number("1,200", true, false).unwrap().alternative,
            None
        );
    }

    #[test]
    fn an_ambiguous_reading_goes_through_the_columns_checks() {
        let range = unit_mistake_check("a storey height", "m", (1.5, 12.0), LENGTH_SLIPS);
        let m = crate::input::columns::find_unit("m");
        let one = crate::input::columns::Factor::ONE;
        // 3,100: 3.1 passes, 3100 does not.
        assert!(matches!(
            read_survey_text("3,100", false, false, "storey_height_m", m, one, &range),
            Checked::Value(v, Some(_)) if v == 3.1
        ));
        // 1,200 as a plan area: both plausible.
        let r = read_survey_text(
            "1,200",
            false,
            false,
            "plan_area_m2",
            m,
            one,
            &positive_check,
        );
        assert!(
            matches!(&r, Checked::Refused(e) if e.contains("1.2") && e.contains("1200")),
            "{r:?}"
        );
        // A unit in the cell: converted, or refused when of another kind.
        assert!(matches!(
            read_survey_text("310 cm", false, false, "storey_height_m", m, one, &range),
            Checked::Value(v, Some(_)) if v == 3.1
        ));
        assert!(matches!(
            read_survey_text("3 kPa", false, false, "storey_height_m", m, one, &range),
            Checked::Refused(e) if e.contains("without its unit")
        ));
        let r = range(3100.0).unwrap_err();
        assert!(r.contains("looks like mm (3.1 m)"), "{r}");
        let r = agr_check(1.5)(2.943).unwrap_err();
        assert!(r.contains("m/s²") && r.contains("0.3 g"), "{r}");
    }

    #[test]
    fn numbers_from_text() {
        assert_eq!(parse_number_text(" 12.5 ", false), Some(12.5));
        assert_eq!(parse_number_text("12,5", true), Some(12.5));
        assert_eq!(parse_number_text("12,5", false), None);
        assert_eq!(parse_number_text("twelve", false), None);
        assert_eq!(parse_number_text("inf", false), None);
        assert_eq!(parse_number_text("NaN", false), None);
    }

    #[test]
    fn float_noise_from_formulas_still_gives_whole_numbers() {
        let row = DataRow {
            row: 2,
            cells: vec![RawCell::Number(2.9999999999999996), RawCell::Number(2.5)],
            ..Default::default()
        };
        let mut p = RowParser::new(&crate::input::columns::STOREYS, &row, false);
        assert_eq!(p.whole("building_id", false), Some(3));
        assert_eq!(p.whole("storey", false), None);
        assert!(p.has_errors());
    }

    /// A buildings row with the given (canonical column, number) cells.
    fn buildings_row(values: &[(&str, f64)]) -> DataRow {
        let mut cells = vec![RawCell::Empty; BUILDINGS.columns.len()];
        for (name, v) in values {
            let i = BUILDINGS
                .columns
                .iter()
                .position(|c| c.name == *name)
                .unwrap_or_else(|| panic!("{name}"));
            cells[i] = RawCell::Number(*v);
        }
        cells[0] = RawCell::Text("T".into());
        DataRow {
            row: 7,
            cells,
            ..Default::default()
        }
    }

    #[test]
    fn limits_follow_the_settings_they_are_made_from() {
        let row = buildings_row(&[
            ("storeys", 70.0),
            ("storey_height_m", 6.5),
            ("floor_weight_kpa", 22.0),
            ("plan_area_m2", 900.0),
            ("column_area_m2", 40.0),
        ]);
        // Built-in limits (inventory.md): above 60 storeys refused, 6.5 m and 22 kPa warned.
        let (_, problems) = building(&row, false, &Limits::default());
        let cols: Vec<_> = problems
            .iter()
            .map(|p| (p.column.as_str(), p.severity))
            .collect();
        assert_eq!(
            cols,
            vec![
                ("storeys", Severity::Error),
                ("storey_height_m", Severity::Warning),
                ("floor_weight_kpa", Severity::Warning)
            ]
        );
        let s = crate::settings::Settings {
            max_storeys: 70.0,
            storey_height_max_m: 6.5,
            floor_weight_max_kpa: 22.0,
            ..Default::default()
        };
        let limits = Limits::from_settings(&s);
        let (b, problems) = building(&row, false, &limits);
        assert!(problems.is_empty(), "{problems:#?}");
        assert_eq!(b.storeys, 70);
        // The unit-mistake ranges are not settings keys.
        assert_eq!(limits.fc_mpa, Limits::default().fc_mpa);
        assert_eq!(limits.fy_mpa, Limits::default().fy_mpa);
    }

    #[test]
    fn years_from_date_texts() {
        assert_eq!(date_text_year("1972-05-01"), Some(1972));
        assert_eq!(date_text_year("01/05/1972"), Some(1972));
        assert_eq!(date_text_year("1972"), None);
    }
}
