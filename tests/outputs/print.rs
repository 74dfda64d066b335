//! The workbook for print, read back from the package (the worksheet XML's `pageSetup`,
//! `headerFooter`, and the workbook's print titles and print areas, ECMA-376 Part 1
//! §18.3.1.63 pageSetup, §18.3.1.46 headerFooter, §18.2.5 definedName `_xlnm.Print_Titles`
//! and `_xlnm.Print_Area`): every sheet landscape, one page wide, caution and "page N of M"
//! in the footer, header row and id columns repeated; Directions, Walls and Flags print only
//! on request (their print area is the header row alone).

use std::collections::HashMap;

use seistriage::report::workbook;

use super::sample;
use super::workbook::package;

/// The value of `attr="…"` in an XML fragment.
fn attr<'a>(xml: &'a str, attr: &str) -> Option<&'a str> {
    let key = format!("{attr}=\"");
    let at = xml.find(&key)? + key.len();
    let end = xml[at..].find('"')?;
    Some(&xml[at..at + end])
}

/// Each `<tag …>` element (its opening tag text) in document order.
fn elements<'a>(xml: &'a str, tag: &str) -> Vec<&'a str> {
    let open = format!("<{tag} ");
    let mut out = Vec::new();
    let mut rest = xml;
    while let Some(i) = rest.find(&open) {
        let end = rest[i..].find('>').map_or(rest.len(), |e| i + e + 1);
        out.push(&rest[i..end]);
        rest = &rest[end..];
    }
    out
}

/// Sheet name -> worksheet XML, through workbook.xml and its relationships.
fn worksheets(files: &[(String, String)]) -> Vec<(String, String)> {
    let get = |name: &str| {
        files
            .iter()
            .find(|(n, _)| n == name)
            .map(|(_, t)| t.as_str())
            .unwrap_or_else(|| panic!("{name} missing"))
    };
    let rels: HashMap<&str, &str> = elements(get("xl/_rels/workbook.xml.rels"), "Relationship")
        .into_iter()
        .map(|e| (attr(e, "Id").unwrap(), attr(e, "Target").unwrap()))
        .collect();
    elements(get("xl/workbook.xml"), "sheet")
        .into_iter()
        .map(|e| {
            let target = rels[attr(e, "r:id").unwrap()];
            let path = format!("xl/{}", target.trim_start_matches("/xl/"));
            (attr(e, "name").unwrap().to_string(), get(&path).to_string())
        })
        .collect()
}

/// The defined names of a kind: (sheet index, formula).
fn defined(workbook_xml: &str, name: &str) -> Vec<(usize, String)> {
    let open = format!("<definedName name=\"{name}\"");
    let mut out = Vec::new();
    let mut rest = workbook_xml;
    while let Some(i) = rest.find(&open) {
        let tag_end = i + rest[i..].find('>').unwrap();
        let close = tag_end + rest[tag_end..].find("</definedName>").unwrap();
        let sheet = attr(&rest[i..tag_end], "localSheetId")
            .unwrap()
            .parse()
            .unwrap();
        out.push((sheet, rest[tag_end + 1..close].to_string()));
        rest = &rest[close..];
    }
    out
}

#[test]
fn every_sheet_is_set_up_for_print() {
    let report = sample::report(24);
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("r.xlsx");
    workbook::write(&report, &out).unwrap();
    let files = package(&out);
    let sheets = worksheets(&files);
    let wb = &files
        .iter()
        .find(|(n, _)| n == "xl/workbook.xml")
        .unwrap()
        .1;
    let titles = defined(wb, "_xlnm.Print_Titles");
    let areas = defined(wb, "_xlnm.Print_Area");
    let index = |name: &str| sheets.iter().position(|(n, _)| n == name).unwrap();
    for (name, xml) in &sheets {
        if name == "Chart data" {
            continue; // hidden: never printed
        }
        let setup = elements(xml, "pageSetup");
        assert_eq!(setup.len(), 1, "{name}: pageSetup");
        assert_eq!(attr(setup[0], "orientation"), Some("landscape"), "{name}");
        // One page wide (fitToWidth defaults to 1), any number tall.
        // The Summary of an ordinary stock fits one page (fitToHeight 1, the default, is
        // left out of the XML).
        let tall = if name == "Summary" { None } else { Some("0") };
        assert_eq!(attr(setup[0], "fitToHeight"), tall, "{name}");
        assert!(
            attr(setup[0], "fitToWidth").is_none_or(|w| w == "1"),
            "{name}"
        );
        assert!(
            xml.contains("<pageSetUpPr fitToPage=\"1\"/>"),
            "{name}: fitToPage"
        );
        let footer = &xml[xml.find("<oddFooter>").expect("footer")..];
        let footer = &footer[..footer.find("</oddFooter>").unwrap()];
        assert!(
            footer.contains(seistriage::CAUTION),
            "{name}: caution in the footer"
        );
        assert!(
            footer.contains("Page &amp;P of &amp;N"),
            "{name}: page N of M"
        );
        assert!(xml.contains("<oddHeader>"), "{name}: header");
        let i = index(name);
        let title = titles
            .iter()
            .find(|(s, _)| *s == i)
            .map(|(_, f)| f.as_str());
        let area = areas.iter().find(|(s, _)| *s == i).map(|(_, f)| f.as_str());
        let q = if name.contains(' ') {
            format!("'{name}'")
        } else {
            name.clone()
        };
        match name.as_str() {
            "Summary" => {
                assert_eq!(title, None);
                assert_eq!(area, None);
            }
            "Priority" | "Retrofit plan" => {
                assert_eq!(
                    title,
                    Some(format!("{q}!$A:$B,{q}!$1:$1").as_str()),
                    "{name}"
                );
                assert_eq!(area, None, "{name}: printed in full");
            }
            "Directions" | "Walls" | "Flags" => {
                assert_eq!(
                    title,
                    Some(format!("{q}!$A:$B,{q}!$1:$1").as_str()),
                    "{name}"
                );
                // Printed only on request: the print area is the header row.
                let a = area.unwrap_or_else(|| panic!("{name}: print area"));
                assert!(
                    a.starts_with(&format!("{q}!$A$1:$")) && a.ends_with("$1"),
                    "{a}"
                );
                assert!(xml.contains("not printed by default"), "{name}: says so");
            }
            _ => {
                assert_eq!(title, Some(format!("{q}!$1:$1").as_str()), "{name}");
                assert_eq!(area, None, "{name}");
            }
        }
    }
    // The Priority sheet hides `funded` (= Plan A, kept for CSV compatibility) and shows the
    // two plan columns.
    let pri = &sheets[index("Priority")].1;
    let cols = workbook::tables::PRIORITY;
    let funded = cols.iter().position(|c| c.key == "funded").unwrap() + 1;
    let hidden: Vec<&str> = elements(pri, "col")
        .into_iter()
        .filter(|c| attr(c, "hidden") == Some("1"))
        .collect();
    assert_eq!(hidden.len(), 1);
    assert_eq!(attr(hidden[0], "min"), Some(funded.to_string().as_str()));
    let keys: Vec<&str> = cols.iter().map(|c| c.key).collect();
    assert!(keys.ends_with(&["funded_plan_a", "funded_plan_b"]));
}

#[test]
fn summary_opens_with_the_decision_and_ends_with_the_tool_parameters() {
    let report = sample::report(24);
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("r.xlsx");
    workbook::write(&report, &out).unwrap();
    let s = super::workbook::sheet(&out, "Summary");
    let col_a: Vec<String> = (0..s.height())
        .map(|r| super::workbook::text(&s, r, 0).unwrap_or_default())
        .collect();
    let at = |label: &str| {
        col_a
            .iter()
            .position(|x| x == label)
            .unwrap_or_else(|| panic!("no {label:?} on Summary"))
    };
    let decision = at("For the decision");
    let params = at("Tool parameters");
    assert!(decision < at("Counts") && at("Buildings per district") < params);
    // The plans by their plain names, in the decision block.
    for label in [
        "Plan A: in priority order",
        "Plan B: most people protected",
        "People in class 1–2 buildings",
        "Cost to fix all class 1–2 buildings",
        "Budget",
    ] {
        let r = at(label);
        assert!(decision < r && r < at("Counts"), "{label}");
    }
    let plan_a = super::workbook::text(&s, at("Plan A: in priority order"), 1).unwrap();
    let walk = &report.budget_plan.as_ref().unwrap().priority_walk;
    assert!(
        plan_a.starts_with(&format!("{} buildings", walk.funded.len())),
        "{plan_a}"
    );
    // File hash and spectrum parameters are below, with the tool parameters.
    assert!(at("SHA-256 of the file") > params);
    assert!(at("Spectrum [spectrum]") > params);
    // No technical plan names in the decision block.
    for label in &col_a[decision..at("Counts")] {
        let t = label.to_lowercase();
        assert!(
            !t.contains("knapsack") && !t.contains("priority walk"),
            "{t}"
        );
    }
}
