/*!
Pre-scan of a legacy `.xls` workbook before calamine reads it. calamine reads every sheet of
an `.xls` into a dense grid when the workbook is opened, so one stray far-away cell would make
it allocate the whole rectangle. This module walks the compound file (CFB) directory to the
`Workbook` stream and the BIFF records in it, without expanding anything, and returns the
grid extent each sheet would take. Every index is bounds-checked; every chain is bounded by
the number of sectors in the file. [`chains_loop`] tells whether one of the chains calamine
follows (without a bound of its own) never ends.
*/

/// Grid extent of one sheet: rows × columns of the bounding box from A1.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct Extent {
    /// Rows (last used row + 1).
    pub rows: u64,
    /// Columns (last used column + 1).
    pub cols: u64,
}

const MAX_REGULAR: u32 = 0xFFFF_FFFA;

fn u16_at(b: &[u8], at: usize) -> Option<u16> {
    Some(u16::from_le_bytes(b.get(at..at + 2)?.try_into().ok()?))
}

fn u32_at(b: &[u8], at: usize) -> Option<u32> {
    Some(u32::from_le_bytes(b.get(at..at + 4)?.try_into().ok()?))
}

struct Cfb<'a> {
    file: &'a [u8],
    ssize: usize,
    fat: Vec<u32>,
}

impl Cfb<'_> {
    fn sector(&self, id: u32) -> Option<&[u8]> {
        let start = (id as usize).checked_add(1)?.checked_mul(self.ssize)?;
        self.file.get(start..start.checked_add(self.ssize)?)
    }

    /// Follows a FAT chain, concatenating sectors, up to `limit` bytes.
    fn chain(&self, start: u32, limit: usize) -> Option<Vec<u8>> {
        let mut out = Vec::new();
        let mut id = start;
        let max_steps = self.file.len() / self.ssize + 1;
        let mut steps = 0;
        while id < MAX_REGULAR && out.len() < limit {
            steps += 1;
            if steps > max_steps {
                return None;
            }
            out.extend_from_slice(self.sector(id)?);
            id = *self.fat.get(id as usize)?;
        }
        out.truncate(limit);
        Some(out)
    }
}

/// The `Workbook` (or `Book`) stream of a compound file, if it can be found.
fn workbook_stream(file: &[u8]) -> Option<Vec<u8>> {
    let shift = u16_at(file, 30)?;
    let ssize = match shift {
        9 => 512,
        12 => 4096,
        _ => return None,
    };
    let mut fat_ids: Vec<u32> = (0..109).filter_map(|i| u32_at(file, 76 + 4 * i)).collect();
    let mut cfb = Cfb {
        file,
        ssize,
        fat: Vec::new(),
    };
    // DIFAT chain.
    let mut difat = u32_at(file, 68)?;
    let mut guard = 0;
    while difat < MAX_REGULAR {
        guard += 1;
        if guard > file.len() / ssize + 1 {
            return None;
        }
        let s = cfb.sector(difat)?;
        let n = ssize / 4 - 1;
        fat_ids.extend((0..n).filter_map(|i| u32_at(s, 4 * i)));
        difat = u32_at(s, 4 * n)?;
    }
    let mut fat = Vec::new();
    for id in fat_ids.into_iter().filter(|id| *id < MAX_REGULAR) {
        let s = cfb.sector(id)?;
        fat.extend((0..ssize / 4).filter_map(|i| u32_at(s, 4 * i)));
    }
    cfb.fat = fat;
    let dirs = cfb.chain(u32_at(file, 48)?, usize::MAX)?;
    let entry = |k: usize| -> Option<(String, u32, u64)> {
        let e = dirs.get(k * 128..k * 128 + 128)?;
        let len = usize::from(u16_at(e, 64)?).min(64);
        let units: Vec<u16> = (0..len.saturating_sub(2) / 2)
            .filter_map(|i| u16_at(e, 2 * i))
            .collect();
        let name = String::from_utf16_lossy(&units);
        let start = u32_at(e, 116)?;
        let size = if ssize == 512 {
            u64::from(u32_at(e, 120)?)
        } else {
            u64::from(u32_at(e, 120)?) | (u64::from(u32_at(e, 124)?) << 32)
        };
        Some((name, start, size))
    };
    let (root_start, root_size) = entry(0).map(|(_, s, z)| (s, z))?;
    let (_, start, size) = (1..dirs.len() / 128)
        .filter_map(entry)
        .find(|(n, _, _)| n.eq_ignore_ascii_case("Workbook") || n.eq_ignore_ascii_case("Book"))?;
    let size = usize::try_from(size).ok()?.min(file.len());
    let cutoff = u32_at(file, 56).unwrap_or(4096) as usize;
    if size >= cutoff {
        return cfb.chain(start, size);
    }
    // Small stream: in the mini stream (64-byte sectors) held by the root entry.
    let mini = cfb.chain(root_start, usize::try_from(root_size).ok()?.min(file.len()))?;
    let minifat_bytes = cfb.chain(u32_at(file, 60)?, usize::MAX)?;
    let minifat: Vec<u32> = (0..minifat_bytes.len() / 4)
        .filter_map(|i| u32_at(&minifat_bytes, 4 * i))
        .collect();
    let mut out = Vec::new();
    let mut id = start;
    let mut steps = 0;
    while id < MAX_REGULAR && out.len() < size {
        steps += 1;
        if steps > mini.len() / 64 + 1 {
            return None;
        }
        let at = (id as usize).checked_mul(64)?;
        out.extend_from_slice(mini.get(at..at + 64)?);
        id = *minifat.get(id as usize)?;
    }
    out.truncate(size);
    Some(out)
}

/// One BIFF record at `at`: (type, data, offset of the next record), as calamine's record
/// iterator reads it; `None` when the stream ends inside the record header or data.
fn record(wb: &[u8], at: usize) -> Option<(u16, &[u8], usize)> {
    let typ = u16_at(wb, at)?;
    let len = usize::from(u16_at(wb, at + 2)?);
    let next = at.checked_add(4 + len)?;
    Some((typ, wb.get(at + 4..next)?, next))
}

/// The cells calamine reserves for a sheet's DIMENSIONS record (BIFF8: first row u32, last
/// row + 1 u32, first column u16, last column + 1 u16; BIFF2–5: all u16), as rows × columns:
/// calamine computes `last − first + 1` in 32 bits before it reserves, so a declared last row
/// before the first wraps to about 2³² rows (its debug build panics instead).
fn dimensions_extent(data: &[u8]) -> Option<Extent> {
    let (rf, rl, mut cf, cl) = match data.len() {
        10 => (
            u32::from(u16_at(data, 0)?),
            u32::from(u16_at(data, 2)?),
            u32::from(u16_at(data, 4)?),
            u32::from(u16_at(data, 6)?),
        ),
        14 | 16 => (
            u32_at(data, 0)?,
            u32_at(data, 4)?,
            u32::from(u16_at(data, 8)?),
            u32::from(u16_at(data, 10)?),
        ),
        _ => return None,
    };
    if cf > 0xFF || cl < cf {
        cf = 0;
    }
    let (end_r, end_c) = if rl >= 1 && cl >= 1 {
        (rl - 1, cl - 1)
    } else {
        (rf, cf)
    };
    Some(Extent {
        rows: u64::from(end_r.wrapping_sub(rf).wrapping_add(1)),
        cols: u64::from(end_c.wrapping_sub(cf).wrapping_add(1)),
    })
}

/// Folds one worksheet record into the extent of its sheet.
fn add_record(e: &mut Extent, typ: u16, data: &[u8]) {
    let mut grow = |rows: u64, cols: u64| {
        e.rows = e.rows.max(rows);
        e.cols = e.cols.max(cols);
    };
    match typ {
        // DIMENSIONS: calamine reserves its rectangle up front.
        0x0200 => {
            if let Some(d) = dimensions_extent(data) {
                grow(d.rows, d.cols);
            }
        }
        // NUMBER, LABEL, LABELSST, RK, BOOLERR, FORMULA, RSTRING.
        0x0203 | 0x0204 | 0x00FD | 0x027E | 0x0205 | 0x0006 | 0x00D6 => {
            if let (Some(r), Some(c)) = (u16_at(data, 0), u16_at(data, 2)) {
                grow(u64::from(r) + 1, u64::from(c) + 1);
            }
        }
        // MULRK: row, first column, …, last column in the final two bytes.
        0x00BD => {
            if let (Some(r), Some(c)) = (
                u16_at(data, 0),
                data.len().checked_sub(2).and_then(|k| u16_at(data, k)),
            ) {
                grow(u64::from(r) + 1, u64::from(c) + 1);
            }
        }
        _ => {}
    }
}

/// The extent of the worksheet whose BOF calamine reads at `pos` (the position a BOUNDSHEET
/// record gives), read as calamine reads it: records up to the sheet's EOF, nested substreams
/// (embedded charts) skipped.
fn sheet_at(wb: &[u8], pos: usize) -> Extent {
    let mut e = Extent::default();
    let (mut at, mut seen_bof, mut depth) = (pos, false, 0usize);
    while let Some((typ, data, next)) = record(wb, at) {
        at = next;
        if depth > 0 {
            match typ {
                0x0809 => depth += 1,
                0x000A => depth -= 1,
                _ => {}
            }
            continue;
        }
        match typ {
            0x0809 if seen_bof => depth += 1,
            0x0809 => seen_bof = true,
            0x000A => break,
            _ => add_record(&mut e, typ, data),
        }
    }
    e
}

/// The grid extent of every worksheet of an `.xls` file; `None` when the file is not a
/// compound file with a readable workbook stream (calamine then reports the problem).
///
/// Worksheets are read as calamine reads them: at each position a BOUNDSHEET record of the
/// workbook globals names, in that order, up to the sheet's EOF with nested substreams
/// skipped (found by fuzzing: a position that is not where the file-order walk sees a
/// substream, with a DIMENSIONS record there, made calamine reserve terabytes). Substreams
/// that no BOUNDSHEET names follow, in file order. A sheet's extent covers its cells from A1
/// and the rectangle its DIMENSIONS record declares (calamine reserves that many cells
/// before it reads any).
pub fn sheet_extents(file: &[u8]) -> Option<Vec<Extent>> {
    let wb = workbook_stream(file)?;
    // The workbook globals: records up to the first EOF.
    let mut positions = Vec::new();
    let mut at = 0usize;
    while let Some((typ, data, next)) = record(&wb, at) {
        at = next;
        match typ {
            0x0085 => positions.extend(u32_at(data, 0).map(|p| p as usize)),
            0x000A => break,
            _ => {}
        }
    }
    // calamine keeps one grid per BOUNDSHEET even when two name the same position (a grid
    // each, so every one counts); the position itself is scanned once.
    let mut seen = std::collections::HashMap::new();
    let mut out: Vec<Extent> = positions
        .iter()
        .map(|&pos| *seen.entry(pos).or_insert_with(|| sheet_at(&wb, pos)))
        .filter(|e| e.rows > 0)
        .collect();
    // Every other substream, in file order.
    let mut cur: Option<Extent> = None;
    let mut at = 0usize;
    while let (Some(typ), Some(len)) = (u16_at(&wb, at), u16_at(&wb, at + 2)) {
        let data = wb.get(at + 4..at + 4 + usize::from(len)).unwrap_or(&[]);
        match typ {
            0x0809 => cur = (!seen.contains_key(&at)).then(Extent::default),
            0x000A => {
                if let Some(e) = cur.take()
                    && e.rows > 0
                {
                    out.push(e);
                }
            }
            _ => {
                if let Some(e) = cur.as_mut() {
                    add_record(e, typ, data);
                }
            }
        }
        at += 4 + usize::from(len);
    }
    Some(out)
}

const ENDOFCHAIN: u32 = 0xFFFF_FFFE;
const DIFSECT: u32 = 0xFFFF_FFFC;

/// What following one sector chain gives, as calamine follows it.
enum Chain {
    /// The chain ends (end-of-chain mark, or the length asked for is reached).
    Bytes(Vec<u8>),
    /// calamine stops with an error (or a caught panic) on the way.
    Fails,
    /// More steps than the file has sectors without reaching either end: calamine would
    /// loop forever (empty sectors at the end of the file) or grow the chain to the
    /// declared length.
    Loops,
}

/// Follows a chain from `start` the way calamine's `Sectors::get_chain` does: a sector is
/// `sector(id)` (short or empty at the end of the data), at most `len` bytes are kept.
fn follow<'a>(
    sector: impl Fn(u32) -> Option<&'a [u8]>,
    fats: &[u32],
    start: u32,
    len: usize,
    max_steps: usize,
) -> Chain {
    let mut out = Vec::new();
    let (mut id, mut steps) = (start, 0usize);
    while id != ENDOFCHAIN {
        let Some(s) = sector(id) else {
            return Chain::Fails;
        };
        let take = s.len().min(len - out.len());
        out.extend_from_slice(s.get(..take).unwrap_or_default());
        if out.len() >= len {
            break;
        }
        steps += 1;
        if steps > max_steps {
            return Chain::Loops;
        }
        let Some(&next) = fats.get(id as usize) else {
            return Chain::Fails;
        };
        id = next;
    }
    Chain::Bytes(out)
}

fn u32s(b: &[u8]) -> impl Iterator<Item = u32> + '_ {
    b.chunks_exact(4)
        .filter_map(|c| c.try_into().ok().map(u32::from_le_bytes))
}

/// Whether a sector chain that calamine follows when it opens the compound file of an
/// `.xls` (the directory, the mini stream and mini FAT, the `Workbook`/`Book` stream) never
/// ends: calamine follows FAT chains without cycle detection, so a chain that points back
/// to itself made it grow a buffer until memory ran out (found by fuzzing), or loop forever
/// over empty sectors. Read as calamine reads the file ([MS-CFB] §2, from memory; layout
/// details as calamine 0.38 `cfb.rs`).
pub fn chains_loop(file: &[u8]) -> bool {
    let Some(ssize) = (match u16_at(file, 30) {
        Some(9) => Some(512usize),
        Some(12) => Some(4096),
        _ => None,
    }) else {
        return false;
    };
    if file.len() < ssize || u16_at(file, 32) != Some(6) {
        return false;
    }
    let data = file.get(ssize..).unwrap_or_default();
    let maxid = file.len() / ssize;
    let sector = |id: u32| -> Option<&[u8]> {
        let id = id as usize;
        if id > maxid {
            return None;
        }
        let start = id.checked_mul(ssize)?.min(data.len());
        data.get(start..start.saturating_add(ssize).min(data.len()))
    };
    // DIFAT: the header's 109 entries, then DIFAT sectors (each ends with the next one).
    let mut difat: Vec<u32> = u32s(file.get(76..512).unwrap_or_default()).collect();
    let mut id = u32_at(file, 68).unwrap_or(ENDOFCHAIN);
    let mut n = 0usize;
    while id < MAX_REGULAR {
        n += 1;
        if n > maxid + 1 {
            return false;
        }
        let Some(s) = sector(id) else { return false };
        difat.extend(u32s(s));
        let Some(next) = difat.pop() else {
            return false;
        };
        id = next;
    }
    let mut fats = Vec::new();
    for id in difat.into_iter().filter(|id| *id < DIFSECT) {
        let Some(s) = sector(id) else { return false };
        fats.extend(u32s(s));
    }
    let dir_start = u32_at(file, 48).unwrap_or(ENDOFCHAIN);
    let dirs = match follow(sector, &fats, dir_start, usize::MAX, maxid + 1) {
        Chain::Bytes(b) => b,
        Chain::Fails => return false,
        Chain::Loops => return true,
    };
    let entries: Vec<(String, u32, usize)> = dirs
        .chunks_exact(128)
        .map(|e| {
            let name: String = String::from_utf16_lossy(
                &e[..64]
                    .chunks_exact(2)
                    .map(|c| u16::from_le_bytes([c[0], c[1]]))
                    .collect::<Vec<_>>(),
            );
            let name = name.split('\0').next().unwrap_or_default().to_string();
            let start = u32_at(e, 116).unwrap_or(ENDOFCHAIN);
            let len = if ssize == 512 {
                u32_at(e, 120).map_or(0, |l| l as usize)
            } else {
                u32_at(e, 120).map_or(0, |l| l as usize)
                    | u32_at(e, 124).map_or(0, |h| (h as usize) << 32)
            };
            (name, start, len)
        })
        .collect();
    let Some(root) = entries.first() else {
        return false;
    };
    let mut mini = Vec::new();
    let mut mini_fats = Vec::new();
    let mini_fat_len = u32_at(file, 64).unwrap_or(0) as usize;
    if mini_fat_len > 0 {
        mini = match follow(sector, &fats, root.1, root.2, maxid + 1) {
            Chain::Bytes(b) => b,
            Chain::Fails => return false,
            Chain::Loops => return true,
        };
        let start = u32_at(file, 60).unwrap_or(ENDOFCHAIN);
        match follow(
            sector,
            &fats,
            start,
            mini_fat_len.saturating_mul(ssize),
            maxid + 1,
        ) {
            Chain::Bytes(b) => mini_fats = u32s(&b).collect(),
            Chain::Fails => return false,
            Chain::Loops => return true,
        }
    }
    // Mini sectors past the mini stream count as empty (calamine reads them from wherever
    // the file reader stands, possibly its end).
    let mini_sector = |id: u32| -> Option<&[u8]> {
        let id = id as usize;
        if id > maxid * 8 {
            return None;
        }
        let start = id.checked_mul(64)?.min(mini.len());
        mini.get(start..start.saturating_add(64).min(mini.len()))
    };
    ["Workbook", "Book"].iter().any(|want| {
        let Some((_, start, len)) = entries
            .iter()
            .find(|(n, _, _)| n.eq_ignore_ascii_case(want))
        else {
            return false;
        };
        let chain = if *len < 4096 {
            follow(mini_sector, &mini_fats, *start, *len, maxid * 8 + 1)
        } else {
            follow(sector, &fats, *start, *len, maxid + 1)
        };
        matches!(chain, Chain::Loops)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn dims(rf: u32, rl: u32, cf: u16, cl: u16) -> Vec<u8> {
        [
            &rf.to_le_bytes()[..],
            &rl.to_le_bytes(),
            &cf.to_le_bytes(),
            &cl.to_le_bytes(),
            &[0, 0],
        ]
        .concat()
    }

    #[test]
    fn dimensions_give_the_rectangle_calamine_reserves() {
        // BIFF8 DIMENSIONS: last row and column are one past the end ([MS-XLS] 2.4.90).
        assert_eq!(
            dimensions_extent(&dims(0, 4, 0, 39)),
            Some(Extent { rows: 4, cols: 39 })
        );
        assert_eq!(
            dimensions_extent(&dims(2, 10, 1, 5)),
            Some(Extent { rows: 8, cols: 4 })
        );
        // Empty sheet: one cell.
        assert_eq!(
            dimensions_extent(&dims(0, 0, 0, 0)),
            Some(Extent { rows: 1, cols: 1 })
        );
        // A last row before the first wraps in calamine's 32-bit arithmetic:
        // (5 − 1) − 10 + 1 = −5, that is 2³² − 5 rows.
        assert_eq!(
            dimensions_extent(&dims(10, 5, 0, 1)).map(|e| e.rows),
            Some((1u64 << 32) - 5)
        );
        assert_eq!(dimensions_extent(&[0; 12]), None);
    }
}
