//! Build script: makes cargo notice new or changed migration files, which
//! `sqlx::migrate!` embeds into the binary at compile time.

fn main() {
    println!("cargo:rerun-if-changed=migrations");
}
