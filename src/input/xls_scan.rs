/*!
Pre-scan of a legacy `.xls` workbook before calamine reads it. calamine reads every sheet of
an `.xls` into a dense grid when the workbook is opened, so one stray far-away cell would make
it allocate the whole rectangle. This module walks the compound file (CFB) directory to the
`Workbook` stream and the BIFF records in it, without expanding anything, and returns the
grid extent each sheet would take. Every index is bounds-checked; every chain is bounded by
the number of sectors in the file.
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

/// The grid extent of every worksheet substream of an `.xls` file, in file order; `None`
/// when the file is not a compound file with a readable workbook stream (calamine then
/// reports the problem).
pub fn sheet_extents(file: &[u8]) -> Option<Vec<Extent>> {
    let wb = workbook_stream(file)?;
    let mut out = Vec::new();
    let mut cur: Option<Extent> = None;
    let mut at = 0usize;
    while let (Some(typ), Some(len)) = (u16_at(&wb, at), u16_at(&wb, at + 2)) {
        let data = wb.get(at + 4..at + 4 + usize::from(len)).unwrap_or(&[]);
        at += 4 + usize::from(len);
        match typ {
            0x0809 => cur = Some(Extent::default()),
            0x000A => {
                if let Some(e) = cur.take()
                    && e.rows > 0
                {
                    out.push(e);
                }
            }
            // NUMBER, LABEL, LABELSST, RK, BOOLERR, FORMULA, RSTRING.
            0x0203 | 0x0204 | 0x00FD | 0x027E | 0x0205 | 0x0006 | 0x00D6 => {
                if let (Some(e), Some(r), Some(c)) =
                    (cur.as_mut(), u16_at(data, 0), u16_at(data, 2))
                {
                    e.rows = e.rows.max(u64::from(r) + 1);
                    e.cols = e.cols.max(u64::from(c) + 1);
                }
            }
            // MULRK: row, first column, …, last column in the final two bytes.
            0x00BD => {
                if let (Some(e), Some(r), Some(c)) = (
                    cur.as_mut(),
                    u16_at(data, 0),
                    data.len().checked_sub(2).and_then(|k| u16_at(data, k)),
                ) {
                    e.rows = e.rows.max(u64::from(r) + 1);
                    e.cols = e.cols.max(u64::from(c) + 1);
                }
            }
            _ => {}
        }
    }
    Some(out)
}
