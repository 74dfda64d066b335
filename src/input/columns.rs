/*!
The one table of canonical columns per sheet (inventory.md): name, unit, meaning, default,
kind of value and extra aliases. The reader, the template and `--help` all read it from here.
*/

/// What kind of value a column holds (decides how a cell is read).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ValueKind {
    /// An identifier kept as text exactly ("0100" stays "0100"; a numeric cell 100.0 → "100").
    Id,
    /// Free text.
    Text,
    /// A decimal number.
    Number,
    /// A whole number.
    Whole,
    /// A year (a bare number is a year; a date cell gives its year with a warning).
    Year,
    /// residential / school / hospital / office / other.
    Use,
    /// yes / no / unknown.
    YesNo,
    /// Ground type A–E.
    Ground,
    /// Direction X / Y.
    Direction,
}

/// One canonical column.
#[derive(Debug, Clone, Copy)]
pub struct Column {
    /// Canonical name (as in inventory.md).
    pub name: &'static str,
    /// Unit or allowed values.
    pub unit: &'static str,
    /// What the column means.
    pub meaning: &'static str,
    /// The default when blank ("—" = none; "required" for required columns).
    pub default: &'static str,
    /// Required column.
    pub required: bool,
    /// ValueKind of value.
    pub kind: ValueKind,
    /// Extra accepted names (matched with the same normalisation rule).
    pub aliases: &'static [&'static str],
}

/// One sheet of the inventory.
#[derive(Debug, Clone, Copy)]
pub struct SheetSpec {
    /// Sheet name (also the sibling CSV suffix: `<stem>.walls.csv`).
    pub name: &'static str,
    /// Whether the sheet must be present.
    pub required: bool,
    /// What one row is.
    pub meaning: &'static str,
    /// Columns in template order.
    pub columns: &'static [Column],
}

impl SheetSpec {
    /// Column by canonical name.
    pub fn column(&self, name: &str) -> Option<&'static Column> {
        self.columns.iter().find(|c| c.name == name)
    }
    /// The required columns' names.
    pub fn required_names(&self) -> Vec<&'static str> {
        self.columns
            .iter()
            .filter(|c| c.required)
            .map(|c| c.name)
            .collect()
    }
}

const fn col(
    name: &'static str,
    unit: &'static str,
    kind: ValueKind,
    required: bool,
    default: &'static str,
    meaning: &'static str,
) -> Column {
    Column {
        name,
        unit,
        meaning,
        default,
        required,
        kind,
        aliases: &[],
    }
}

const fn alias(mut c: Column, aliases: &'static [&'static str]) -> Column {
    c.aliases = aliases;
    c
}

use ValueKind::*;

/// Sheet `buildings` (required): one row per building.
pub const BUILDINGS: SheetSpec = SheetSpec {
    name: "buildings",
    required: true,
    meaning: "one row per building",
    columns: &[
        alias(
            col(
                "id",
                "text, unique",
                Id,
                true,
                "required",
                "Building identifier, unique in the sheet; kept as text exactly.",
            ),
            &["building_id"],
        ),
        col("name", "text", Text, false, "\"\"", "Building name."),
        alias(
            col(
                "use",
                "residential, school, hospital, office, other",
                Use,
                false,
                "residential",
                "Building use; selects the importance factor.",
            ),
            &["occupancy"],
        ),
        alias(
            col(
                "year_built",
                "year",
                Year,
                false,
                "unknown",
                "Year of construction (a number; a date cell gives its year).",
            ),
            &["construction_year", "year_of_construction"],
        ),
        alias(
            col(
                "latitude",
                "decimal degrees WGS84",
                Number,
                false,
                "— (no district or fault lookup)",
                "Latitude of the building.",
            ),
            &["lat"],
        ),
        alias(
            col(
                "longitude",
                "decimal degrees WGS84",
                Number,
                false,
                "— (no district or fault lookup)",
                "Longitude of the building.",
            ),
            &["lon", "lng", "long"],
        ),
        col(
            "district",
            "text",
            Text,
            false,
            "from district polygons if given, else \"\"",
            "District name.",
        ),
        alias(
            col(
                "storeys",
                "whole number ≥ 1 above the base",
                Whole,
                true,
                "required",
                "Number of storeys above the base.",
            ),
            &["stories", "floors", "number_of_storeys"],
        ),
        col(
            "storey_height_m",
            "m",
            Number,
            false,
            "3.0 (settings)",
            "Typical storey height.",
        ),
        col(
            "ground_storey_height_m",
            "m",
            Number,
            false,
            "storey_height_m",
            "Ground-storey height.",
        ),
        col(
            "plan_area_m2",
            "m²",
            Number,
            true,
            "required",
            "Plan area of a typical storey.",
        ),
        col(
            "plan_length_x_m",
            "m",
            Number,
            false,
            "— (footprint table if any)",
            "Plan length along X.",
        ),
        col(
            "plan_length_y_m",
            "m",
            Number,
            false,
            "— (footprint table if any)",
            "Plan length along Y.",
        ),
        col(
            "column_area_m2",
            "m²",
            Number,
            true,
            "required",
            "Total cross-section area of the ground-storey columns (0 when walls carry the building).",
        ),
        col(
            "column_depth_m",
            "m",
            Number,
            false,
            "0.40 (settings)",
            "Typical column depth.",
        ),
        col(
            "rc_wall_area_x_m2",
            "m²",
            Number,
            false,
            "from walls sheet, else 0",
            "Ground-storey RC wall area parallel to X.",
        ),
        col(
            "rc_wall_area_y_m2",
            "m²",
            Number,
            false,
            "from walls sheet, else 0",
            "Ground-storey RC wall area parallel to Y.",
        ),
        col(
            "wall_length_x_m",
            "m",
            Number,
            false,
            "4.0 (settings)",
            "Typical RC wall length along X.",
        ),
        col(
            "wall_length_y_m",
            "m",
            Number,
            false,
            "4.0 (settings)",
            "Typical RC wall length along Y.",
        ),
        col(
            "wall_thickness_m",
            "m",
            Number,
            false,
            "0.25 (settings)",
            "RC wall thickness.",
        ),
        col(
            "infill_area_x_m2",
            "m²",
            Number,
            false,
            "0",
            "Ground-storey masonry infill area parallel to X.",
        ),
        col(
            "infill_area_y_m2",
            "m²",
            Number,
            false,
            "0",
            "Ground-storey masonry infill area parallel to Y.",
        ),
        col(
            "upper_rc_wall_area_x_m2",
            "m²",
            Number,
            false,
            "same as ground (no soft-storey information)",
            "RC wall area parallel to X in the storey above the ground storey.",
        ),
        col(
            "upper_rc_wall_area_y_m2",
            "m²",
            Number,
            false,
            "same as ground (no soft-storey information)",
            "RC wall area parallel to Y in the storey above the ground storey.",
        ),
        col(
            "upper_infill_area_x_m2",
            "m²",
            Number,
            false,
            "same as ground (no soft-storey information)",
            "Infill area parallel to X in the storey above the ground storey.",
        ),
        col(
            "upper_infill_area_y_m2",
            "m²",
            Number,
            false,
            "same as ground (no soft-storey information)",
            "Infill area parallel to Y in the storey above the ground storey.",
        ),
        col(
            "upper_column_area_m2",
            "m²",
            Number,
            false,
            "same as ground (no soft-storey information)",
            "Column area in the storey above the ground storey.",
        ),
        col(
            "boundary_elements",
            "yes / no / unknown",
            YesNo,
            false,
            "unknown",
            "Confined boundary elements at wall ends.",
        ),
        col(
            "short_columns",
            "yes / no / unknown",
            YesNo,
            false,
            "unknown",
            "Short (captive) columns present.",
        ),
        col(
            "fc_mpa",
            "MPa",
            Number,
            false,
            "era table, else 20 (settings)",
            "Concrete compressive strength (5–120 MPa).",
        ),
        col(
            "fy_mpa",
            "MPa",
            Number,
            false,
            "era table, else 420 (settings)",
            "Reinforcement yield strength (150–700 MPa).",
        ),
        col(
            "floor_weight_kpa",
            "kPa",
            Number,
            false,
            "12 (settings)",
            "Seismic weight per unit floor area.",
        ),
        col(
            "occupants",
            "whole number",
            Whole,
            false,
            "—",
            "Number of occupants (for the budget plan).",
        ),
        col(
            "ground_type",
            "A, B, C, D, E",
            Ground,
            false,
            "settings",
            "Ground type of EN 1998-1 Table 3.1.",
        ),
        col(
            "agr_g",
            "g",
            Number,
            false,
            "settings",
            "Reference peak ground acceleration on rock.",
        ),
        col(
            "sds_g",
            "g",
            Number,
            false,
            "settings",
            "Two-parameter spectrum: short-period ordinate SDS.",
        ),
        col(
            "sd1_g",
            "g",
            Number,
            false,
            "settings",
            "Two-parameter spectrum: 1-second ordinate SD1.",
        ),
        col(
            "period_x_s",
            "s",
            Number,
            false,
            "formula of method §4",
            "Fundamental period along X from an analysis.",
        ),
        col(
            "period_y_s",
            "s",
            Number,
            false,
            "formula of method §4",
            "Fundamental period along Y from an analysis.",
        ),
    ],
};

/// Sheet `walls` (optional): one row per RC wall.
pub const WALLS: SheetSpec = SheetSpec {
    name: "walls",
    required: false,
    meaning: "one row per RC wall (any storey)",
    columns: &[
        alias(
            col(
                "building_id",
                "text",
                Id,
                true,
                "required",
                "Id of the building (buildings sheet).",
            ),
            &["building"],
        ),
        col("wall_id", "text", Id, false, "\"\"", "Wall identifier."),
        col(
            "direction",
            "X / Y",
            Direction,
            true,
            "required",
            "Direction the wall length is parallel to.",
        ),
        col("length_m", "m", Number, true, "required", "Wall length lw."),
        col(
            "thickness_m",
            "m",
            Number,
            false,
            "building's wall_thickness_m",
            "Wall thickness tw.",
        ),
        col(
            "x_m",
            "m",
            Number,
            false,
            "—",
            "Wall centre x in the footprint's local plan frame.",
        ),
        col(
            "y_m",
            "m",
            Number,
            false,
            "—",
            "Wall centre y in the footprint's local plan frame.",
        ),
        col(
            "boundary_elements",
            "yes / no / unknown",
            YesNo,
            false,
            "building's value",
            "Confined boundary elements at this wall's ends.",
        ),
        col(
            "boundary_steel_pct",
            "%",
            Number,
            false,
            "1.0 (settings)",
            "Boundary longitudinal steel ratio.",
        ),
        col(
            "web_steel_pct",
            "%",
            Number,
            false,
            "0.25 (settings)",
            "Web vertical steel ratio.",
        ),
        col(
            "bar_diameter_mm",
            "mm",
            Number,
            false,
            "16 (settings)",
            "Longitudinal bar diameter.",
        ),
        col(
            "start_storey",
            "whole number ≥ 1",
            Whole,
            false,
            "1 (ground)",
            "First storey of the wall (> 1: does not reach the foundation).",
        ),
        col(
            "end_storey",
            "whole number ≥ 1",
            Whole,
            false,
            "top storey",
            "Last storey of the wall.",
        ),
    ],
};

/// Sheet `storeys` (optional): one row per storey per building.
pub const STOREYS: SheetSpec = SheetSpec {
    name: "storeys",
    required: false,
    meaning: "one row per storey per building",
    columns: &[
        alias(
            col(
                "building_id",
                "text",
                Id,
                true,
                "required",
                "Id of the building (buildings sheet).",
            ),
            &["building"],
        ),
        alias(
            col(
                "storey",
                "whole number ≥ 1 (1 = ground)",
                Whole,
                true,
                "required",
                "Storey number.",
            ),
            &["story", "floor"],
        ),
        col(
            "height_m",
            "m",
            Number,
            false,
            "building's storey height",
            "Storey height.",
        ),
        col(
            "column_area_m2",
            "m²",
            Number,
            false,
            "building's value",
            "Column area of this storey.",
        ),
        col(
            "rc_wall_area_x_m2",
            "m²",
            Number,
            false,
            "building's value",
            "RC wall area parallel to X.",
        ),
        col(
            "rc_wall_area_y_m2",
            "m²",
            Number,
            false,
            "building's value",
            "RC wall area parallel to Y.",
        ),
        col(
            "infill_area_x_m2",
            "m²",
            Number,
            false,
            "building's value",
            "Infill area parallel to X.",
        ),
        col(
            "infill_area_y_m2",
            "m²",
            Number,
            false,
            "building's value",
            "Infill area parallel to Y.",
        ),
    ],
};

/// Sheet `footprints` (optional): plan polygons in local metres.
pub const FOOTPRINTS: SheetSpec = SheetSpec {
    name: "footprints",
    required: false,
    meaning: "one row per vertex of a building's plan polygon (local metres)",
    columns: &[
        alias(
            col(
                "building_id",
                "text",
                Id,
                true,
                "required",
                "Id of the building (buildings sheet).",
            ),
            &["building"],
        ),
        col(
            "vertex",
            "number (order)",
            Number,
            true,
            "required",
            "Vertex order along the polygon.",
        ),
        col(
            "x_m",
            "m",
            Number,
            true,
            "required",
            "Vertex x in the local plan frame.",
        ),
        col(
            "y_m",
            "m",
            Number,
            true,
            "required",
            "Vertex y in the local plan frame.",
        ),
    ],
};

/// Sheet `settings` (optional): key / value rows.
pub const SETTINGS: SheetSpec = SheetSpec {
    name: "settings",
    required: false,
    meaning: "one row per settings key (see templates/settings.toml)",
    columns: &[
        alias(
            col(
                "key",
                "settings key",
                Text,
                true,
                "required",
                "A key of the settings file.",
            ),
            &["setting", "name"],
        ),
        col(
            "value",
            "text or number",
            Text,
            true,
            "required",
            "Its value (empty = unset).",
        ),
    ],
};

/// What a unit measures; units convert only within one kind.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// Lengths (base m).
    Length,
    /// Areas (base m²).
    Area,
    /// Stresses and pressures (base kPa).
    Stress,
    /// Angles (base deg).
    Angle,
    /// Percentages (base %).
    Percent,
    /// Accelerations (base g).
    Acceleration,
    /// Times (base s).
    Time,
}

impl Quantity {
    /// A plain-words name for messages.
    pub fn name(self) -> &'static str {
        match self {
            Quantity::Length => "a length",
            Quantity::Area => "an area",
            Quantity::Stress => "a stress",
            Quantity::Angle => "an angle",
            Quantity::Percent => "a percentage",
            Quantity::Acceleration => "an acceleration",
            Quantity::Time => "a time",
        }
    }
}

/// One known unit: how it is written (after [`super::header::normalise`]), what it
/// measures and its size in the base unit of its kind.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Unit {
    /// How the unit is shown in messages.
    pub label: &'static str,
    /// Accepted spellings, normalised (lower case, `²` → `2`).
    pub spellings: &'static [&'static str],
    /// What it measures.
    pub quantity: Quantity,
    /// Size in the base unit of its kind = `num / den` (mm = 1/1000 m; MPa = 1000/1 kPa;
    /// m/s² = 1/9.81 g), kept as a fraction so that a conversion divides where it should
    /// (250 mm → 250 / 1000 = 0.25 m exactly, as typed in metres).
    pub num: f64,
    /// See `num`.
    pub den: f64,
}

/// A conversion between two units of one kind: `v × mul ÷ div`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Factor {
    /// Multiplier.
    pub mul: f64,
    /// Divisor.
    pub div: f64,
}

impl Factor {
    /// No conversion.
    pub const ONE: Factor = Factor { mul: 1.0, div: 1.0 };
    /// The conversion from `from` to `to` (same kind).
    pub fn between(from: &Unit, to: &Unit) -> Factor {
        Factor {
            mul: from.num * to.den,
            div: from.den * to.num,
        }
    }
    /// Converts a value.
    pub fn apply(self, v: f64) -> f64 {
        if self == Self::ONE {
            v
        } else {
            v * self.mul / self.div
        }
    }
}

/// Standard gravity used to read an acceleration given in m/s² as g (inventory.md: agr_g
/// in m/s² is divided by 9.81).
pub const G_M_S2: f64 = 9.81;

const fn unit(
    label: &'static str,
    spellings: &'static [&'static str],
    quantity: Quantity,
    num: f64,
    den: f64,
) -> Unit {
    Unit {
        label,
        spellings,
        quantity,
        num,
        den,
    }
}

/// Every unit the reader knows (inventory.md's header rule): lengths mm, cm, m (and km for
/// settings such as near_fault_km); areas mm², cm², m²; stresses N/mm² = MPa, kN/m² = kPa;
/// angles ° = deg; percentages pct or %; accelerations g and m/s² (÷ 9.81); times s. A
/// header or cell unit is converted to the column's canonical unit when both are of the
/// same kind; any other unit is refused.
pub const UNITS: &[Unit] = &[
    unit(
        "mm",
        &[
            "mm",
            "millimetre",
            "millimetres",
            "millimeter",
            "millimeters",
        ],
        Quantity::Length,
        1.0,
        1000.0,
    ),
    unit(
        "cm",
        &[
            "cm",
            "centimetre",
            "centimetres",
            "centimeter",
            "centimeters",
        ],
        Quantity::Length,
        1.0,
        100.0,
    ),
    unit(
        "m",
        &["m", "metre", "metres", "meter", "meters"],
        Quantity::Length,
        1.0,
        1.0,
    ),
    unit("km", &["km"], Quantity::Length, 1000.0, 1.0),
    unit("mm²", &["mm2", "sq_mm"], Quantity::Area, 1.0, 1e6),
    unit("cm²", &["cm2", "sq_cm"], Quantity::Area, 1.0, 1e4),
    unit("m²", &["m2", "sq_m", "sqm"], Quantity::Area, 1.0, 1.0),
    unit("MPa", &["mpa", "n/mm2"], Quantity::Stress, 1000.0, 1.0),
    unit("kPa", &["kpa", "kn/m2"], Quantity::Stress, 1.0, 1.0),
    unit(
        "deg",
        &["deg", "°", "degrees", "degree"],
        Quantity::Angle,
        1.0,
        1.0,
    ),
    unit("%", &["%", "pct", "percent"], Quantity::Percent, 1.0, 1.0),
    unit("g", &["g"], Quantity::Acceleration, 1.0, 1.0),
    unit(
        "m/s²",
        &["m/s2", "m/s^2", "m/sec2"],
        Quantity::Acceleration,
        1.0,
        G_M_S2,
    ),
    unit("s", &["s", "sec", "seconds"], Quantity::Time, 1.0, 1.0),
];

/// The known unit of a (normalised or raw) spelling.
pub fn find_unit(text: &str) -> Option<&'static Unit> {
    let n = super::header::normalise(text);
    let n = n.trim_matches('_');
    UNITS.iter().find(|u| u.spellings.contains(&n))
}

/// The canonical unit of a column, from its `unit` text (None for text, whole numbers,
/// years and other unitless columns).
pub fn canonical_unit(c: &Column) -> Option<&'static Unit> {
    match c.unit {
        "decimal degrees WGS84" => find_unit("deg"),
        u => find_unit(u),
    }
}

/// The canonical unit of a settings key: its last `_token` when that is a known unit
/// (`near_fault_km` → km, `agr_g` → g, `fc_reference_mpa` → MPa).
pub fn key_unit(key: &str) -> Option<&'static Unit> {
    let (_, last) = key.rsplit_once('_')?;
    find_unit(last)
}

/// The canonical name without its unit suffix (`plan_area_m2` → `plan_area`).
pub fn name_without_unit(c: &Column) -> &'static str {
    if let Some(u) = canonical_unit(c)
        && let Some((head, last)) = c.name.rsplit_once('_')
        && !head.is_empty()
        && u.spellings.contains(&last)
    {
        return head;
    }
    c.name
}

/// Sheet `eras` (optional): the era table of the settings, as a sheet; replaces the
/// settings' `[[era]]` rows when present.
pub const ERAS: SheetSpec = SheetSpec {
    name: "eras",
    required: false,
    meaning: "one row per construction era (replaces the settings' [[era]] table)",
    columns: &[
        col(
            "from_year",
            "year",
            Year,
            false,
            "open (no lower end)",
            "First year of the era (inclusive).",
        ),
        col(
            "to_year",
            "year",
            Year,
            false,
            "open (no upper end)",
            "Last year of the era (inclusive).",
        ),
        col(
            "fc_mpa",
            "MPa",
            Number,
            false,
            "default_fc_mpa (settings)",
            "Concrete compressive strength of buildings of the era (5–120 MPa).",
        ),
        col(
            "fy_mpa",
            "MPa",
            Number,
            false,
            "default_fy_mpa (settings)",
            "Reinforcement yield strength of buildings of the era (150–700 MPa).",
        ),
    ],
};

/// The header-matching rule with its units and aliases, printed in `--help` and on the
/// template's read-me sheet. A test keeps it in step with [`UNITS`] and the aliases.
pub const HEADER_RULE_HELP: &str = "Column names are matched after normalising: lower case; '²' -> '2'; runs of spaces, \
'_' and '-' -> one '_'. The unit of a header is the text in its last brackets or parentheses \
(\"Wall thickness (mm)\"), else a trailing known unit (\"plan area m2\"); the rest is the name, \
compared with the canonical name without its unit. 'Plan Area [m2]', 'plan-area m²', \
'PLAN_AREA_M2' and 'plan area' all match plan_area_m2. The canonical unit (or none) is read as \
is; another unit of the same kind is converted, with a warning on the header row: lengths mm, \
cm, m, km; areas mm², cm², m² (also mm2, cm2, m2, sq_m, sqm); stresses MPa = N/mm², kPa = kN/m²; \
angles deg = °; percentages % = pct = percent; accelerations g, m/s² (divided by 9.81); times s \
(also sec). A unit of another kind, or one not listed, is an error on that column, which is then \
not used (for a required column the file is refused). Extra accepted names: building_id for \
id; occupancy for use; construction_year, year_of_construction for year_built; lat for \
latitude; lon, lng, long for longitude; stories, floors, number_of_storeys for storeys; \
building for building_id (walls, storeys, footprints); story, floor for storey; setting, name \
for key.";

/// How survey text in a numeric cell is read (inventory.md), printed on the read-me sheet.
pub const SURVEY_TEXT_HELP: &str = "Numbers written as text are read with a warning: a decimal comma ('3,2'); digits grouped \
in threes by spaces or apostrophes ('1 200', '1'200'); both separators ('1.200,5': the last one \
is the decimal mark); the column's unit after the number ('20 MPa', '3.1 m'; another unit of \
the same kind is converted); a circa year ('c. 1960', 'ca 1960', '~1960'). A period alone is \
always the decimal mark. '1,200' is ambiguous: each reading goes through the column's checks; \
when both pass the cell is refused, showing both. The settings sheet and file follow the same \
rules. Values that look like a unit mistake are refused, naming the likely unit: storey height \
outside 1.5-12 m, wall thickness 0.05-1.5 m, column depth 0.1-3 m, wall length 0.3-100 m, \
agr_g above 1.5 g (m/s²?), floor weight outside 2-40 kPa.";

/// Every sheet, in template order.
pub const SHEETS: [&SheetSpec; 6] = [&BUILDINGS, &WALLS, &STOREYS, &FOOTPRINTS, &ERAS, &SETTINGS];

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::header::normalise_key;
    use std::collections::HashSet;

    #[test]
    fn canonical_names_and_aliases_stay_distinct_after_normalising() {
        for sheet in SHEETS {
            let mut seen = HashSet::new();
            for c in sheet.columns {
                for n in std::iter::once(&c.name).chain(c.aliases.iter()) {
                    assert!(
                        seen.insert(normalise_key(n)),
                        "{}: {n} collides after normalising",
                        sheet.name
                    );
                }
            }
        }
    }
}

#[cfg(test)]
mod help_tests {
    use super::SHEETS;

    #[test]
    fn every_unit_is_named_in_the_help_text() {
        for u in super::UNITS {
            assert!(
                crate::input::HEADER_RULE_HELP.contains(u.label),
                "unit {} missing from HEADER_RULE_HELP",
                u.label
            );
        }
    }

    #[test]
    fn every_alias_is_named_in_the_help_text() {
        for sheet in SHEETS {
            for c in sheet.columns {
                for a in c.aliases.iter().filter(|a| !a.contains(' ')) {
                    assert!(
                        crate::input::HEADER_RULE_HELP.contains(a),
                        "alias {a} of {} missing from HEADER_RULE_HELP",
                        c.name
                    );
                }
            }
        }
    }
}
