//! One module per command (xsv style). Each `run` returns the process exit code.

pub mod check;
pub mod demo;
pub mod explain;
pub mod generate;
pub mod screen;
pub mod template;

/// True when an error chain ends in a broken pipe (stdout closed by `head` and friends).
pub fn is_broken_pipe(e: &anyhow::Error) -> bool {
    e.chain().any(|c| {
        c.downcast_ref::<std::io::Error>()
            .is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
    })
}
