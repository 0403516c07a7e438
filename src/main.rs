//! `parhelion` command line: parse, call the library, print, map errors to exit codes.

fn main() {
    println!("parhelion {}", env!("CARGO_PKG_VERSION"));
}
