/*!
The header-matching rule of inventory.md, in one place: normalise a header cell and a
canonical name the same way, strip one trailing unit token, compare. Also finds the header
row of a sheet (the row that holds the required names) and maps columns.
*/

use super::columns::{
    Column, Factor, SheetSpec, Unit, canonical_unit, find_unit, name_without_unit,
};

/// Unit tokens stripped once from the end of a normalised name.
pub const UNIT_TOKENS: [&str; 12] = [
    "m", "m2", "mm", "kn", "kpa", "mpa", "g", "s", "pct", "%", "deg", "year",
];

/// Lower case; `²` → `2`, `³` → `3`; brackets and parentheses removed; runs of spaces, `_`
/// and `-` → one `_` (trimmed at both ends).
pub fn normalise(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    let mut pending_sep = false;
    for ch in text.trim().chars().flat_map(char::to_lowercase) {
        let ch = match ch {
            '²' => '2',
            '³' => '3',
            '[' | ']' | '(' | ')' | '{' | '}' => {
                pending_sep = true;
                continue;
            }
            c => c,
        };
        if ch.is_whitespace() || ch == '_' || ch == '-' {
            pending_sep = true;
            continue;
        }
        if pending_sep && !out.is_empty() {
            out.push('_');
        }
        pending_sep = false;
        out.push(ch);
    }
    out
}

/// [`normalise`], then strip one trailing unit token (when something remains before it).
pub fn normalise_key(text: &str) -> String {
    let n = normalise(text);
    if let Some((head, last)) = n.rsplit_once('_')
        && !head.is_empty()
        && UNIT_TOKENS.contains(&last)
    {
        return head.to_string();
    }
    // "area%" style: a '%' glued to the name.
    if let Some(head) = n.strip_suffix('%')
        && !head.is_empty()
    {
        return head.trim_end_matches('_').to_string();
    }
    n
}

/// A header cell split by inventory.md's rule into its name (normalised) and its unit (as
/// written): the unit is the text in the last pair of brackets or parentheses, else a
/// trailing token that is a known unit ([`super::columns::UNITS`]).
pub fn split_unit(text: &str) -> (String, Option<String>) {
    let t = text.trim();
    let close = t.rfind([')', ']']);
    if let Some(c) = close {
        let open_ch = if t[c..].starts_with(')') { '(' } else { '[' };
        if let Some(o) = t[..c].rfind(open_ch) {
            let inner = t[o + 1..c].trim();
            let name = format!("{} {}", &t[..o], &t[c + 1..]);
            let n = normalise(&name);
            if !inner.is_empty() && !n.is_empty() {
                return (n, Some(inner.to_string()));
            }
            if !n.is_empty() {
                return (n, None);
            }
        }
    }
    let n = normalise(t);
    if let Some((head, last)) = n.rsplit_once('_')
        && !head.is_empty()
        && super::columns::find_unit(last).is_some()
    {
        return (head.to_string(), Some(last.to_string()));
    }
    // "area%" style: a '%' glued to the name.
    if let Some(head) = n.strip_suffix('%')
        && !head.trim_end_matches('_').is_empty()
    {
        return (head.trim_end_matches('_').to_string(), Some("%".into()));
    }
    (n, None)
}

/// How the header cells of one sheet map to canonical columns.
#[derive(Debug, Clone, Default)]
pub struct HeaderMap {
    /// (0-based column index, canonical name) for every matched column.
    pub matched: Vec<(usize, &'static str)>,
    /// Header texts that match no column (kept and ignored).
    pub unknown: Vec<String>,
    /// Canonical names matched by more than one header cell: (name, header texts).
    pub duplicates: Vec<(&'static str, Vec<String>)>,
    /// Required columns not found (or found with a unit that cannot be used).
    pub missing_required: Vec<&'static str>,
    /// Matched columns whose header unit is converted: (canonical name, factor to the
    /// canonical unit, the warning naming the conversion).
    pub conversions: Vec<(&'static str, Factor, String)>,
    /// Columns not used because of their header unit: (canonical name, the error).
    pub unit_errors: Vec<(&'static str, String)>,
}

impl HeaderMap {
    /// Column index of a canonical name.
    pub fn index(&self, name: &str) -> Option<usize> {
        self.matched
            .iter()
            .find(|(_, n)| *n == name)
            .map(|(i, _)| *i)
    }
    /// Number of canonical columns matched.
    pub fn score(&self) -> usize {
        self.matched.len() + self.unit_errors.len()
    }
    /// The factor of a column's header unit to its canonical unit (1 when as is).
    pub fn factor(&self, name: &str) -> Factor {
        self.conversions
            .iter()
            .find(|(n, _, _)| *n == name)
            .map_or(Factor::ONE, |(_, f, _)| *f)
    }
}

/// Canonical column of one header text, if any (whatever its unit).
pub fn match_column(spec: &SheetSpec, header: &str) -> Option<&'static str> {
    match_spec_column(spec, header).map(|c| c.name)
}

fn match_spec_column(spec: &SheetSpec, header: &str) -> Option<&'static Column> {
    let (key, _) = split_unit(header);
    if key.is_empty() {
        return None;
    }
    spec.columns.iter().find(|c| {
        normalise(name_without_unit(c)) == key
            || normalise(c.name) == key
            || c.aliases.iter().any(|a| normalise_key(a) == key)
    })
}

/// A factor as people write it: "× 0.001" for 0.001 is "÷ 1000".
pub fn factor_text(f: Factor) -> String {
    let n = super::raw::format_number;
    match (f.mul == 1.0, f.div == 1.0) {
        (true, false) => format!("÷ {}", n(f.div)),
        (false, true) => format!("× {}", n(f.mul)),
        _ => format!("× {} ÷ {}", n(f.mul), n(f.div)),
    }
}

/// The factor from a unit written in a header or cell to a column's canonical unit, or why
/// it cannot be used. `Ok(None)`: the canonical unit itself (or, for a unitless column,
/// a note that is not a unit).
pub fn unit_factor(
    canonical: Option<&'static Unit>,
    column: &str,
    written: &str,
) -> Result<Option<(Factor, &'static Unit)>, String> {
    let known = find_unit(written);
    match (canonical, known) {
        (None, None) => Ok(None),
        (None, Some(u)) => Err(format!(
            "{column} has no unit, found the unit {}; write the number alone",
            u.label
        )),
        (Some(c), None) => Err(format!(
            "expected {column} in {} ({}), found the unit \"{written}\", which the reader does not know (known units: {}); write the values in {} or use a known unit",
            c.label,
            c.quantity.name(),
            known_units_text(c.quantity),
            c.label
        )),
        (Some(c), Some(u)) if u.quantity != c.quantity => Err(format!(
            "expected {column} in {} ({}), found the unit {}, which is {}; write the values in {}",
            c.label,
            c.quantity.name(),
            u.label,
            u.quantity.name(),
            c.label
        )),
        (Some(c), Some(u)) if u.label == c.label => Ok(None),
        (Some(c), Some(u)) => Ok(Some((Factor::between(u, c), u))),
    }
}

/// The known units of one kind, for messages ("mm, cm, m, km").
pub fn known_units_text(q: super::columns::Quantity) -> String {
    super::columns::UNITS
        .iter()
        .filter(|u| u.quantity == q)
        .map(|u| u.label)
        .collect::<Vec<_>>()
        .join(", ")
}

/// Maps a row of header texts (column index, text) to canonical columns.
pub fn map_headers(spec: &SheetSpec, headers: &[(usize, String)]) -> HeaderMap {
    let mut map = HeaderMap::default();
    let mut seen: Vec<(&'static str, Vec<String>)> = Vec::new();
    for (idx, text) in headers {
        if text.trim().is_empty() {
            continue;
        }
        match match_spec_column(spec, text) {
            Some(col) => {
                let name = col.name;
                if let Some(entry) = seen.iter_mut().find(|(n, _)| *n == name) {
                    entry.1.push(text.clone());
                    continue;
                }
                let (_, written) = split_unit(text);
                let factor = match written {
                    None => Ok(None),
                    Some(w) => unit_factor(canonical_unit(col), name, &w),
                };
                match factor {
                    Err(e) => {
                        map.unit_errors.push((
                            name,
                            format!("column \"{}\": {e}; the column is not used", text.trim()),
                        ));
                        continue;
                    }
                    Ok(Some((f, u))) => {
                        let c = canonical_unit(col).map_or("", |c| c.label);
                        map.conversions.push((
                            name,
                            f,
                            format!(
                                "column \"{}\" is in {}: its values are converted to {c} ({}) for {name}",
                                text.trim(),
                                u.label,
                                factor_text(f)
                            ),
                        ));
                    }
                    Ok(None) => {}
                }
                seen.push((name, vec![text.clone()]));
                map.matched.push((*idx, name));
            }
            None => map.unknown.push(text.clone()),
        }
    }
    map.duplicates = seen.into_iter().filter(|(_, v)| v.len() > 1).collect();
    map.missing_required = spec
        .required_names()
        .into_iter()
        .filter(|n| map.index(n).is_none())
        .collect();
    map
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::columns::BUILDINGS;

    #[test]
    fn the_examples_of_inventory_md_match() {
        for h in [
            "Plan Area [m2]",
            "plan-area m²",
            "PLAN_AREA_M2",
            "plan area",
            "  Plan__Area (m²) ",
        ] {
            assert_eq!(match_column(&BUILDINGS, h), Some("plan_area_m2"), "{h}");
        }
        assert_eq!(match_column(&BUILDINGS, "fc [MPa]"), Some("fc_mpa"));
        assert_eq!(
            match_column(&BUILDINGS, "Storey Height (m)"),
            Some("storey_height_m")
        );
        assert_eq!(match_column(&BUILDINGS, "Year Built"), Some("year_built"));
        assert_eq!(match_column(&BUILDINGS, "ID"), Some("id"));
        assert_eq!(match_column(&BUILDINGS, "colour"), None);
    }

    #[test]
    fn header_units_are_found_in_the_last_brackets_or_a_trailing_token() {
        assert_eq!(
            split_unit("Wall thickness (mm)"),
            ("wall_thickness".into(), Some("mm".into()))
        );
        assert_eq!(
            split_unit("Wall (RC) thickness [cm]"),
            ("wall_rc_thickness".into(), Some("cm".into()))
        );
        assert_eq!(
            split_unit("PLAN_AREA_M2"),
            ("plan_area".into(), Some("m2".into()))
        );
        assert_eq!(split_unit("plan area"), ("plan_area".into(), None));
        let m = map_headers(&BUILDINGS, &[(0, "Wall thickness (mm)".into())]);
        assert_eq!(m.factor("wall_thickness_m").apply(250.0), 0.25);
        let m = map_headers(&BUILDINGS, &[(0, "fc (psi)".into())]);
        assert!(m.matched.is_empty() && m.unit_errors.len() == 1, "{m:?}");
        let m = map_headers(&BUILDINGS, &[(0, "agR [m/s²]".into())]);
        assert_eq!(m.factor("agr_g").apply(2.943), 2.943 / 9.81);
        let m = map_headers(&BUILDINGS, &[(0, "Wall thickness (kPa)".into())]);
        assert!(m.matched.is_empty() && m.unit_errors.len() == 1, "{m:?}");
        let f = |from: &str, to: &str| {
            Factor::between(find_unit(from).unwrap(), find_unit(to).unwrap())
        };
        assert_eq!(factor_text(f("mm", "m")), "÷ 1000");
        assert_eq!(factor_text(f("m/s2", "g")), "÷ 9.81");
        assert_eq!(factor_text(f("mpa", "kpa")), "× 1000");
    }

    #[test]
    fn a_lone_unit_word_is_not_stripped_to_nothing() {
        assert_eq!(normalise_key("year"), "year");
        assert_eq!(normalise_key("m"), "m");
        assert_eq!(normalise_key("steel %"), "steel");
    }
}
