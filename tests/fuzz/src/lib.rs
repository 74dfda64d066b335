/*!
Helpers shared by the fuzz targets: writing the fuzzer's bytes to a file with the right
extension (the readers take a path), wrapping bytes into the container a format needs (so
that the fuzzer mutates the XML or BIFF records inside, not only the zip or compound-file
framing), and the checks every target makes after a read.
*/

use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

use seistriage::input::guard;
use seistriage::pipeline::{self, RunOptions};

/// A folder of this process for the files a target writes (in memory when /dev/shm exists).
pub fn work_dir() -> &'static Path {
    static DIR: OnceLock<PathBuf> = OnceLock::new();
    DIR.get_or_init(|| {
        let base = Path::new("/dev/shm");
        let base = if base.is_dir() {
            base.to_path_buf()
        } else {
            std::env::temp_dir()
        };
        let dir = base.join(format!("seistriage-fuzz-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        dir
    })
}

/// Writes `bytes` to `name` in the work folder.
pub fn write_file(name: &str, bytes: &[u8]) -> PathBuf {
    let p = work_dir().join(name);
    std::fs::write(&p, bytes).unwrap();
    p
}

/// Reads an inventory file the way `seistriage screen` does (read, settings, geography) and,
/// when it reads, screens it and serialises the report. Checks the row count identity and
/// that no panic in seistriage's own code was swallowed by `input::guard`.
pub fn load_and_screen(path: &Path) {
    if let Ok(loaded) = pipeline::load(path, &RunOptions::default()) {
        let inv = &loaded.inventory;
        assert_eq!(inv.rows, inv.buildings.len() + inv.not_screened.len());
        let report = pipeline::screen(&loaded);
        let _ = serde_json::to_vec(&report);
    }
    assert_eq!(
        guard::own_panics(),
        0,
        "a panic in seistriage's own code was caught by input::guard"
    );
}

fn stored() -> zip::write::SimpleFileOptions {
    zip::write::SimpleFileOptions::default().compression_method(zip::CompressionMethod::Stored)
}

const CONTENT_TYPES: &str = r#"<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/><Override PartName="/xl/styles.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml"/></Types>"#;
const ROOT_RELS: &str = r#"<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>"#;
const WORKBOOK_RELS: &str = r#"<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="sharedStrings.xml"/><Relationship Id="rId3" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/styles" Target="styles.xml"/></Relationships>"#;
const WORKBOOK: &str = r#"<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="buildings" sheetId="1" r:id="rId1"/></sheets></workbook>"#;
const STYLES: &str = r#"<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<styleSheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><numFmts count="1"><numFmt numFmtId="164" formatCode="yyyy"/></numFmts><cellXfs count="2"><xf numFmtId="0"/><xf numFmtId="164" applyNumberFormat="1"/></cellXfs></styleSheet>"#;

/// An .xlsx package (stored, not deflated) with one sheet `buildings` whose worksheet XML is
/// `sheet` and whose shared-strings part is `shared`.
pub fn xlsx_from_parts(sheet: &[u8], shared: &[u8]) -> Vec<u8> {
    let mut z = zip::ZipWriter::new(std::io::Cursor::new(Vec::new()));
    let parts: [(&str, &[u8]); 7] = [
        ("[Content_Types].xml", CONTENT_TYPES.as_bytes()),
        ("_rels/.rels", ROOT_RELS.as_bytes()),
        ("xl/_rels/workbook.xml.rels", WORKBOOK_RELS.as_bytes()),
        ("xl/workbook.xml", WORKBOOK.as_bytes()),
        ("xl/styles.xml", STYLES.as_bytes()),
        ("xl/worksheets/sheet1.xml", sheet),
        ("xl/sharedStrings.xml", shared),
    ];
    for (name, bytes) in parts {
        z.start_file(name, stored()).unwrap();
        z.write_all(bytes).unwrap();
    }
    z.finish().unwrap().into_inner()
}

/// An .ods package (stored) whose `content.xml` is `content`.
pub fn ods_from_content(content: &[u8]) -> Vec<u8> {
    let mut z = zip::ZipWriter::new(std::io::Cursor::new(Vec::new()));
    z.start_file("mimetype", stored()).unwrap();
    z.write_all(b"application/vnd.oasis.opendocument.spreadsheet")
        .unwrap();
    z.start_file("META-INF/manifest.xml", stored()).unwrap();
    z.write_all(br#"<?xml version="1.0" encoding="UTF-8"?><manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0" manifest:version="1.2"><manifest:file-entry manifest:full-path="/" manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/><manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/></manifest:manifest>"#).unwrap();
    z.start_file("content.xml", stored()).unwrap();
    z.write_all(content).unwrap();
    z.finish().unwrap().into_inner()
}

/// A minimal compound file (CFB v3, 512-byte sectors, one FAT sector) holding one stream
/// named `Workbook` (padded to 4096 bytes so that no mini stream is needed; at most 126
/// sectors, longer streams are cut). Layout from [MS-CFB] §2 (from memory), as the helper of
/// the same name in tests/input_cases/cases.rs.
pub fn compound_file(stream: &[u8]) -> Vec<u8> {
    let put16 =
        |f: &mut Vec<u8>, at: usize, v: u16| f[at..at + 2].copy_from_slice(&v.to_le_bytes());
    let put32 =
        |f: &mut Vec<u8>, at: usize, v: u32| f[at..at + 4].copy_from_slice(&v.to_le_bytes());
    let mut b = stream[..stream.len().min(126 * 512)].to_vec();
    if b.len() < 4096 {
        b.resize(4096, 0);
    }
    let n = b.len().div_ceil(512);
    let total = 2 + n;
    let mut f = vec![0u8; 512 * (1 + total)];
    f[..8].copy_from_slice(&[0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1]);
    put16(&mut f, 24, 0x003E);
    put16(&mut f, 26, 3);
    put16(&mut f, 28, 0xFFFE);
    put16(&mut f, 30, 9);
    put16(&mut f, 32, 6);
    put32(&mut f, 44, 1);
    put32(&mut f, 48, 1);
    put32(&mut f, 56, 4096);
    put32(&mut f, 60, 0xFFFF_FFFE);
    put32(&mut f, 68, 0xFFFF_FFFE);
    for i in 0..109 {
        put32(&mut f, 76 + 4 * i, if i == 0 { 0 } else { 0xFFFF_FFFF });
    }
    let fat = 512;
    for i in 0..128 {
        put32(&mut f, fat + 4 * i, 0xFFFF_FFFF);
    }
    put32(&mut f, fat, 0xFFFF_FFFD);
    put32(&mut f, fat + 4, 0xFFFF_FFFE);
    for k in 0..n {
        let id = 2 + k;
        let next = if k + 1 == n {
            0xFFFF_FFFE
        } else {
            (id + 1) as u32
        };
        put32(&mut f, fat + 4 * id, next);
    }
    f[512 * 3..512 * 3 + b.len()].copy_from_slice(&b);
    let entries = [
        ("Root Entry", 5u8, 0xFFFF_FFFEu32, 0u32),
        ("Workbook", 2u8, 2, b.len() as u32),
    ];
    for (k, (name, kind, start, size)) in entries.iter().enumerate() {
        let at = 1024 + 128 * k;
        let utf16: Vec<u8> = name.encode_utf16().flat_map(u16::to_le_bytes).collect();
        f[at..at + utf16.len()].copy_from_slice(&utf16);
        put16(&mut f, at + 64, (utf16.len() + 2) as u16);
        f[at + 66] = *kind;
        put32(&mut f, at + 68, 0xFFFF_FFFF);
        put32(&mut f, at + 72, 0xFFFF_FFFF);
        put32(&mut f, at + 76, if k == 0 { 1 } else { 0xFFFF_FFFF });
        put32(&mut f, at + 116, *start);
        put32(&mut f, at + 120, *size);
    }
    f
}
