//! A JSON field whose name is chosen at run time (the stratigraphic axis: `height` or `depth`),
//! for views that `#[serde(flatten)]` it among their fixed fields.

use serde::ser::{Serialize, SerializeMap, Serializer};

/// One field `name: value`, serialized as a map of one entry (flatten it into a view).
#[derive(Debug, Clone, Copy)]
pub struct Keyed<'a> {
    /// Field name.
    pub name: &'a str,
    /// Its value.
    pub value: f64,
}

impl Serialize for Keyed<'_> {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let mut m = s.serialize_map(Some(1))?;
        m.serialize_entry(self.name, &self.value)?;
        m.end()
    }
}
