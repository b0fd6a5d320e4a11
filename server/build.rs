// Rebuild when a migration, template or static asset changes: all three are
// compiled into the binary (sqlx::migrate!, askama, include_bytes!).
fn main() {
    println!("cargo:rerun-if-changed=migrations");
    println!("cargo:rerun-if-changed=web");
}
