/*!
Typed cells → typed records, one row at a time, with a problem for every cell that cannot be
read or is out of its plausible range (`sheet, row, column: expected …, found …`). No
defaults of the method are applied: a blank optional cell stays `None`.
*/

use super::columns::{BUILDINGS, FOOTPRINTS, STOREYS, SheetSpec, WALLS};
use super::raw::{DataRow, RawCell, format_number};
use super::xlsx::year_of_serial;
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
}

impl Limits {
    /// The limits of effective settings: the settings keys `max_storeys`,
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

/// Reads a number from text: `12.5`, `-3`, `1e3`; `12,5` when decimal commas are allowed.
pub fn parse_number_text(text: &str, decimal_comma: bool) -> Option<f64> {
    let t = text.trim().trim_start_matches('+');
    let owned;
    let t = if decimal_comma && t.contains(',') && !t.contains('.') && t.matches(',').count() == 1 {
        owned = t.replace(',', ".");
        owned.as_str()
    } else {
        t
    };
    if t.is_empty()
        || !t
            .bytes()
            .all(|b| b.is_ascii_digit() || matches!(b, b'.' | b'-' | b'e' | b'E' | b'+'))
    {
        return None;
    }
    let v: f64 = t.parse().ok()?;
    v.is_finite().then_some(v)
}

impl<'a> RowParser<'a> {
    /// A parser over one data row.
    pub fn new(spec: &'static SheetSpec, row: &'a DataRow, decimal_comma: bool) -> Self {
        Self {
            spec,
            row: row.row,
            cells: &row.cells,
            decimal_comma,
            hint: std::cell::Cell::new(0),
            problems: Vec::new(),
        }
    }

    /// Whether any error was recorded.
    pub fn has_errors(&self) -> bool {
        self.problems.iter().any(|p| p.severity == Severity::Error)
    }

    fn cell(&self, name: &str) -> &'a RawCell {
        const EMPTY: &RawCell = &RawCell::Empty;
        let cells: &'a [RawCell] = self.cells;
        // Columns are mostly read in table order: search from the last hit onwards.
        let cols = self.spec.columns;
        let n = cols.len();
        let start = self.hint.get();
        for k in 0..n {
            let i = (start + k) % n;
            if cols.get(i).is_some_and(|c| c.name == name) {
                self.hint.set(i);
                return cells.get(i).unwrap_or(EMPTY);
            }
        }
        EMPTY
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

    fn unreadable(&mut self, name: &str, expected: &str) {
        let found = describe(self.cell(name));
        self.error(name, format!("expected {expected}, found {found}"));
    }

    /// A number; `None` when blank or unreadable (then an error is recorded).
    pub fn number(&mut self, name: &str) -> Option<f64> {
        match self.cell(name) {
            RawCell::Empty => None,
            RawCell::Number(v) if v.is_finite() => Some(*v),
            RawCell::Text(t) => match parse_number_text(t, self.decimal_comma) {
                Some(v) => Some(v),
                None => {
                    self.unreadable(name, "a number");
                    None
                }
            },
            _ => {
                self.unreadable(name, "a number");
                None
            }
        }
    }

    /// A required number; an error when blank.
    pub fn required_number(&mut self, name: &str) -> Option<f64> {
        if self.cell(name).is_blank() {
            self.error(
                name,
                "expected a number (required), found a blank cell".into(),
            );
            return None;
        }
        self.number(name)
    }

    /// A whole number (12.0 is 12; 2.5 is an error).
    pub fn whole(&mut self, name: &str, required: bool) -> Option<i64> {
        if required && self.cell(name).is_blank() {
            self.error(
                name,
                "expected a whole number (required), found a blank cell".into(),
            );
            return None;
        }
        let v = self.number(name)?;
        // A formula result such as 2.9999999999999996 is the whole number a person sees.
        let r = v.round();
        let v = if (v - r).abs() <= 1e-9 * r.abs().max(1.0) {
            r
        } else {
            v
        };
        if v.fract() != 0.0 || v.abs() > 1e12 {
            self.error(
                name,
                format!("expected a whole number, found {}", format_number(v)),
            );
            return None;
        }
        Some(v as i64)
    }

    /// A number that must be > 0 (when given).
    pub fn positive(&mut self, name: &str) -> Option<f64> {
        let v = self.number(name)?;
        if v <= 0.0 {
            self.error(
                name,
                format!(
                    "expected a number greater than 0, found {}",
                    format_number(v)
                ),
            );
            return None;
        }
        Some(v)
    }

    /// A number that must be ≥ 0 (when given).
    pub fn non_negative(&mut self, name: &str) -> Option<f64> {
        let v = self.number(name)?;
        if v < 0.0 {
            self.error(
                name,
                format!(
                    "expected a number of at least 0, found {}",
                    format_number(v)
                ),
            );
            return None;
        }
        Some(v)
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
                if let Some(v) = parse_number_text(t, false).filter(|v| in_range(*v)) {
                    v as i32
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
    b.latitude = p.number("latitude");
    b.longitude = p.number("longitude");
    if let Some(v) = b.latitude.filter(|v| !(-90.0..=90.0).contains(v)) {
        p.error(
            "latitude",
            format!(
                "expected decimal degrees between -90 and 90, found {}",
                format_number(v)
            ),
        );
        b.latitude = None;
    }
    if let Some(v) = b.longitude.filter(|v| !(-180.0..=180.0).contains(v)) {
        p.error(
            "longitude",
            format!(
                "expected decimal degrees between -180 and 180, found {}",
                format_number(v)
            ),
        );
        b.longitude = None;
    }
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
    b.district = p.text("district");
    let max_storeys = limits.max_storeys;
    if let Some(n) = p.whole("storeys", true) {
        if n < 1 || n as f64 > max_storeys {
            p.error(
                "storeys",
                format!(
                    "expected a whole number from 1 to {}, found {n}",
                    format_number(max_storeys)
                ),
            );
        } else {
            b.storeys = n as u32;
        }
    }
    for name in ["storey_height_m", "ground_storey_height_m"] {
        let v = p.positive(name);
        if let Some(v) = v {
            let (lo, hi) = limits.storey_height_m;
            if v < lo || v > hi {
                p.warn(name, format!("expected a storey height from {} to {} m, found {} m (unusual but possible; used as given)", format_number(lo), format_number(hi), format_number(v)));
            }
        }
        match name {
            "storey_height_m" => b.storey_height_m = v,
            _ => b.ground_storey_height_m = v,
        }
    }
    if p.required_number("plan_area_m2").is_some() {
        // Re-read as positive to report ≤ 0.
        if let Some(v) = p.positive("plan_area_m2") {
            b.plan_area_m2 = v;
        }
    }
    b.plan_length_x_m = p.positive("plan_length_x_m");
    b.plan_length_y_m = p.positive("plan_length_y_m");
    if p.required_number("column_area_m2").is_some()
        && let Some(v) = p.non_negative("column_area_m2")
    {
        b.column_area_m2 = v;
    }
    b.column_depth_m = p.positive("column_depth_m");
    b.rc_wall_area_x_m2 = p.non_negative("rc_wall_area_x_m2");
    b.rc_wall_area_y_m2 = p.non_negative("rc_wall_area_y_m2");
    b.wall_length_x_m = p.positive("wall_length_x_m");
    b.wall_length_y_m = p.positive("wall_length_y_m");
    b.wall_thickness_m = p.positive("wall_thickness_m");
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
                        format_number(v)
                    ),
                );
            }
        }
    }
    b.boundary_elements = p.yes_no("boundary_elements");
    b.short_columns = p.yes_no("short_columns");
    for (name, (lo, hi)) in [("fc_mpa", limits.fc_mpa), ("fy_mpa", limits.fy_mpa)] {
        let v = p.number(name);
        let v = match v {
            Some(v) if v < lo || v > hi => {
                p.error(
                    name,
                    format!(
                        "expected {} to {} MPa, found {} (a unit mistake?)",
                        format_number(lo),
                        format_number(hi),
                        format_number(v)
                    ),
                );
                None
            }
            v => v,
        };
        match name {
            "fc_mpa" => b.fc_mpa = v,
            _ => b.fy_mpa = v,
        }
    }
    b.floor_weight_kpa = p.positive("floor_weight_kpa");
    if let Some(v) = b.floor_weight_kpa {
        let (lo, hi) = limits.floor_weight_kpa;
        if v < lo || v > hi {
            p.warn("floor_weight_kpa", format!("expected a floor weight from {} to {} kPa, found {} kPa (unusual but possible; used as given)", format_number(lo), format_number(hi), format_number(v)));
        }
    }
    b.occupants = match p.whole("occupants", false) {
        Some(n) if n < 0 => {
            p.error(
                "occupants",
                format!("expected a whole number of at least 0, found {n}"),
            );
            None
        }
        Some(n) => Some(n as u64),
        None => None,
    };
    b.ground_type = p.ground("ground_type");
    b.agr_g = p.non_negative("agr_g");
    b.sds_g = p.non_negative("sds_g");
    b.sd1_g = p.non_negative("sd1_g");
    b.period_x_s = p.positive("period_x_s");
    b.period_y_s = p.positive("period_y_s");
    (b, p.problems)
}

fn storey_number(p: &mut RowParser<'_>, name: &str, required: bool) -> Option<u32> {
    let n = p.whole(name, required)?;
    if !(1..=1000).contains(&n) {
        p.error(
            name,
            format!("expected a storey number of at least 1, found {n}"),
        );
        return None;
    }
    Some(n as u32)
}

/// Reads one row of the `walls` sheet.
pub fn wall(row: &DataRow, decimal_comma: bool) -> (WallRecord, Vec<Problem>) {
    let mut p = RowParser::new(&WALLS, row, decimal_comma);
    let mut w = WallRecord {
        row: row.row,
        ..Default::default()
    };
    w.building_id = p.id("building_id").unwrap_or_default();
    w.wall_id = p.text("wall_id").unwrap_or_default();
    w.direction = p.direction("direction");
    if p.required_number("length_m").is_some()
        && let Some(v) = p.positive("length_m")
    {
        w.length_m = v;
    }
    w.thickness_m = p.positive("thickness_m");
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

/// Reads one row of the `storeys` sheet.
pub fn storey(row: &DataRow, decimal_comma: bool) -> (StoreyRecord, Vec<Problem>) {
    let mut p = RowParser::new(&STOREYS, row, decimal_comma);
    let mut s = StoreyRecord {
        row: row.row,
        ..Default::default()
    };
    s.building_id = p.id("building_id").unwrap_or_default();
    s.storey = storey_number(&mut p, "storey", true).unwrap_or(0);
    s.height_m = p.positive("height_m");
    s.column_area_m2 = p.non_negative("column_area_m2");
    s.rc_wall_area_x_m2 = p.non_negative("rc_wall_area_x_m2");
    s.rc_wall_area_y_m2 = p.non_negative("rc_wall_area_y_m2");
    s.infill_area_x_m2 = p.non_negative("infill_area_x_m2");
    s.infill_area_y_m2 = p.non_negative("infill_area_y_m2");
    (s, p.problems)
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

    #[test]
    fn numbers_from_text() {
        assert_eq!(parse_number_text(" 12.5 ", false), Some(12.5));
        assert_eq!(parse_number_text("12,5", true), Some(12.5));
        assert_eq!(parse_number_text("12,5", false), None);
        assert_eq!(parse_number_text("1,500.5", true), None);
        assert_eq!(parse_number_text("twelve", false), None);
        assert_eq!(parse_number_text("inf", false), None);
        assert_eq!(parse_number_text("NaN", false), None);
    }

    #[test]
    fn float_noise_from_formulas_still_gives_whole_numbers() {
        let row = DataRow {
            row: 2,
            cells: vec![RawCell::Number(2.9999999999999996), RawCell::Number(2.5)],
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
        DataRow { row: 7, cells }
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
