//! Allocator settings for large Series.
//!
//! Every elementwise operation on a Series of 10^6 elements writes a fresh 8 MB buffer. glibc
//! may serve blocks that large with mmap and return them to the system on free (whether it
//! does depends on its history: it raises its threshold only after such a block is freed), so
//! an operation can pay for page faults on 2 000 fresh pages. In `benches/compare.sh` that made
//! `a*b + c/2` on 10^6 elements 5.3× slower than the Rust loop instead of 1.8×. Keeping large
//! blocks on the heap lets a freed buffer serve the next operation, whatever came before.

/// Keep large blocks on the heap and do not hand freed memory back to the system after each
/// free (glibc `mallopt`; no effect elsewhere). Call once, before the work starts.
pub fn keep_large_blocks() {
    #[cfg(all(target_os = "linux", target_env = "gnu"))]
    // SAFETY: mallopt only changes two tuning parameters of the C allocator; it is called
    // before other threads start and has no memory-safety preconditions.
    unsafe {
        libc::mallopt(libc::M_MMAP_THRESHOLD, 1 << 30);
        libc::mallopt(libc::M_TRIM_THRESHOLD, 1 << 30);
    }
}
