/*!
The header-matching rule of inventory.md, in one place: normalise a header cell and a
canonical name the same way, strip one trailing unit token, compare. Also finds the header
row of a sheet (the row that holds the required names) and maps columns.
*/

use super::columns::SheetSpec;

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

/// How the header cells of one sheet map to canonical columns.
#[derive(Debug, Clone, Default)]
pub struct HeaderMap {
    /// (0-based column index, canonical name) for every matched column.
    pub matched: Vec<(usize, &'static str)>,
    /// Header texts that match no column (kept and ignored).
    pub unknown: Vec<String>,
    /// Canonical names matched by more than one header cell: (name, header texts).
    pub duplicates: Vec<(&'static str, Vec<String>)>,
    /// Required columns not found.
    pub missing_required: Vec<&'static str>,
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
        self.matched.len()
    }
}

/// Canonical column of one header text, if any.
pub fn match_column(spec: &SheetSpec, header: &str) -> Option<&'static str> {
    let key = normalise_key(header);
    if key.is_empty() {
        return None;
    }
    spec.columns
        .iter()
        .find(|c| normalise_key(c.name) == key || c.aliases.iter().any(|a| normalise_key(a) == key))
        .map(|c| c.name)
}

/// Maps a row of header texts (column index, text) to canonical columns.
pub fn map_headers(spec: &SheetSpec, headers: &[(usize, String)]) -> HeaderMap {
    let mut map = HeaderMap::default();
    let mut seen: Vec<(&'static str, Vec<String>)> = Vec::new();
    for (idx, text) in headers {
        if text.trim().is_empty() {
            continue;
        }
        match match_column(spec, text) {
            Some(name) => {
                if let Some(entry) = seen.iter_mut().find(|(n, _)| *n == name) {
                    entry.1.push(text.clone());
                } else {
                    seen.push((name, vec![text.clone()]));
                    map.matched.push((*idx, name));
                }
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
    fn a_lone_unit_word_is_not_stripped_to_nothing() {
        assert_eq!(normalise_key("year"), "year");
        assert_eq!(normalise_key("m"), "m");
        assert_eq!(normalise_key("steel %"), "steel");
    }
}
