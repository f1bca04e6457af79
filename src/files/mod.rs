//! Pipelines that end in a folder of files: the `report` folder, the files of a map or shard, and the files
//! of a map merged from its shards. They compute with the library, render with `export` and `plot`, and write
//! through `output` (temporary file + rename).

pub mod map;
pub mod merge;
pub mod report;

pub use map::{write_map, MapFiles};
pub use merge::{merge_parts, Merged};
pub use report::{write_report, ReportOptions};
