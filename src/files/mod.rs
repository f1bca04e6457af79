//! Pipelines that end in a folder of files: the `report` folder and the files of a map. They compute with the
//! library, render with `export` and `plot`, and write through `output` (temporary file + rename).

pub mod map;
pub mod report;

pub use map::write_map;
pub use report::{write_report, ReportOptions};
