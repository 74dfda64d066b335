/*!
Method §9: demand/capacity ratios per direction and level, and the governing direction and
element group.
*/

use crate::model::Dir;
use crate::results::{FrameAlone, Group, Levels, LsCp};
use crate::settings::Level;

/// Ratio demand/capacity, 0 when the capacity is not positive (guarded; capacities of §8
/// are always positive).
pub fn ratio(demand: f64, capacity: f64) -> f64 {
    if capacity > 0.0 {
        demand / capacity
    } else {
        0.0
    }
}

/// Per-level DCR of one element group: δ / θ_L.
pub fn group_dcr(demand: f64, capacity: &Levels) -> Levels {
    Levels {
        io: ratio(demand, capacity.io),
        ls: ratio(demand, capacity.ls),
        cp: ratio(demand, capacity.cp),
    }
}

/// DCR_d,L = max(δ_w/θ_w,L, δ_c/θ_c,L) over the groups present (method §9).
pub fn direction_dcr(walls: Option<Levels>, columns: Option<Levels>) -> Levels {
    let z = Levels::default();
    let w = walls.unwrap_or(z);
    let c = columns.unwrap_or(z);
    Levels {
        io: w.io.max(c.io),
        ls: w.ls.max(c.ls),
        cp: w.cp.max(c.cp),
    }
}

/// Applies the frame-alone bound of method §9 to a direction's DCR: DCR_d,L =
/// min(DCR_d,L, DCR_frame,d,L) for L = LS, CP (IO untouched: at IO a wall's damage is
/// damage). Returns the bound with `governs` set where DCR_frame is strictly lower.
pub fn apply_frame_alone(dcr: &mut Levels, mut bound: FrameAlone) -> FrameAlone {
    bound.governs = LsCp {
        ls: bound.dcr.ls < dcr.ls,
        cp: bound.dcr.cp < dcr.cp,
    };
    dcr.ls = dcr.ls.min(bound.dcr.ls);
    dcr.cp = dcr.cp.min(bound.dcr.cp);
    bound
}

/// True when the frame-alone bound gives the direction's DCR at `level` (never at IO).
pub fn frame_alone_governs(bound: &FrameAlone, level: Level) -> bool {
    match level {
        Level::Io => false,
        Level::Ls => bound.governs.ls,
        Level::Cp => bound.governs.cp,
    }
}

/// The group that gives a direction's DCR at a level: walls on ties (method §9).
pub fn governing_group(walls: Option<Levels>, columns: Option<Levels>, level: Level) -> Group {
    match (walls, columns) {
        (Some(w), Some(c)) => {
            if w.at(level) >= c.at(level) {
                Group::Walls
            } else {
                Group::Columns
            }
        }
        (None, Some(_)) => Group::Columns,
        _ => Group::Walls,
    }
}

/// The governing direction: the larger DCR at the ranking level, X on ties (method §9).
pub fn governing_direction(x: &Levels, y: &Levels, level: Level) -> Dir {
    if y.at(level) > x.at(level) {
        Dir::Y
    } else {
        Dir::X
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn ties() {
        let a = Levels {
            io: 1.0,
            ls: 1.0,
            cp: 1.0,
        };
        assert_eq!(governing_direction(&a, &a, Level::Ls), Dir::X);
        assert_eq!(governing_group(Some(a), Some(a), Level::Ls), Group::Walls);
        assert_eq!(ratio(1.0, 0.0), 0.0);
    }

    #[test]
    fn frame_alone_bound_at_ls_and_cp_only() {
        let mut d = Levels {
            io: 2.0,
            ls: 1.2,
            cp: 0.9,
        };
        let b = FrameAlone {
            dcr: LsCp { ls: 0.8, cp: 0.95 },
            ..FrameAlone::default()
        };
        let b = apply_frame_alone(&mut d, b);
        // LS: 0.8 < 1.2 governs; CP: 0.95 > 0.9 does not; IO untouched.
        assert_eq!((d.io, d.ls, d.cp), (2.0, 0.8, 0.9));
        assert!(b.governs.ls && !b.governs.cp);
        assert!(frame_alone_governs(&b, Level::Ls));
        assert!(!frame_alone_governs(&b, Level::Cp));
        assert!(!frame_alone_governs(&b, Level::Io));
        // Equal is not strictly lower: the walls' DCR stays the governing one.
        let mut e = Levels {
            io: 1.0,
            ls: 0.8,
            cp: 0.6,
        };
        let b = apply_frame_alone(&mut e, b);
        assert!(!b.governs.ls);
        assert_eq!(e.ls, 0.8);
    }
}
