//! The built binary on inventories the tests generate (canonical columns of inventory.md).
