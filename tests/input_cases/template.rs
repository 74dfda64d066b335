//! The committed blank inventory template is current.
