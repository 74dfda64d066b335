/*!
seistriage: seismic screening and retrofit prioritisation of existing reinforced-concrete
building stocks.

Layers, from the edges in:
- [`input`] reads an inventory workbook or CSV into typed records and problems (no
  engineering);
- [`geography`] places buildings in districts and measures their distance to fault traces;
- [`engine`] is the screening method of `method.md` §0–§11 as pure functions on typed values;
- [`retrofit`] sizes wall retrofits, costs them and plans a budget (§12);
- [`pipeline`] runs the whole job, one flow for a whole file and a stock read in chunks:
  chunks are screened and handed to the outputs (sinks), and it returns a
  [`results::Screening`];
- [`report`] writes the report as a workbook, JSON, CSV, GeoJSON and terminal text.

Screening only: the results rank buildings for detailed evaluation; they are not a
substitute for a detailed evaluation by a licensed engineer under the local code.
*/

pub mod demo;
pub mod engine;
pub mod geography;
pub mod input;
pub mod model;
pub mod pipeline;
pub mod report;
pub mod results;
pub mod retrofit;
pub mod settings;
pub mod stream;
pub mod template;
pub mod uncertainty;

/// The screening caution printed on every output.
pub const CAUTION: &str = "CAUTION: screening only. These results rank buildings for further study; \
they are not a substitute for a detailed seismic evaluation by a licensed engineer under the local code.";
