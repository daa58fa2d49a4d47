//! Lanes of f64 for the step kernel: the kernel is written once over [`Vf`], and runs with
//! plain `f64` (one design) or with four designs per AVX register. Every operation is a
//! single correctly rounded IEEE operation in both (no fused multiply-add, no reordering),
//! so a design flown in a vector lane gets bit for bit the numbers it gets alone.

use std::ops::{Add, Div, Mul, Sub};

/// A vector of `N` f64 lanes with the operations of the step kernel.
pub trait Vf:
    Copy + Add<Output = Self> + Sub<Output = Self> + Mul<Output = Self> + Div<Output = Self>
{
    const N: usize;
    fn splat(x: f64) -> Self;
    /// Lanes `at .. at + N` of `a`.
    fn load(a: &[f64], at: usize) -> Self;
    fn store(self, a: &mut [f64], at: usize);
    /// `if a > b { a } else { b }` per lane (one instruction; finite inputs in practice).
    fn max(self, b: Self) -> Self;
    /// `if a < b { a } else { b }` per lane.
    fn min(self, b: Self) -> Self;
    /// `if self > b { then } else { 0 }` per lane.
    fn gt_or_zero(self, b: Self, then: Self) -> Self;
    /// Lane 0.
    fn first(self) -> f64;
}

impl Vf for f64 {
    const N: usize = 1;
    #[inline(always)]
    fn splat(x: f64) -> f64 {
        x
    }
    #[inline(always)]
    fn load(a: &[f64], at: usize) -> f64 {
        a[at]
    }
    #[inline(always)]
    fn store(self, a: &mut [f64], at: usize) {
        a[at] = self;
    }
    #[inline(always)]
    fn max(self, b: f64) -> f64 {
        if self > b { self } else { b }
    }
    #[inline(always)]
    fn min(self, b: f64) -> f64 {
        if self < b { self } else { b }
    }
    #[inline(always)]
    fn gt_or_zero(self, b: f64, then: f64) -> f64 {
        if self > b { then } else { 0.0 }
    }
    #[inline(always)]
    fn first(self) -> f64 {
        self
    }
}

#[cfg(target_arch = "x86_64")]
pub use avx::F4;

#[cfg(target_arch = "x86_64")]
mod avx {
    //! Four lanes in one 256-bit register. These operations are only ever executed inside
    //! functions compiled with `#[target_feature(enable = "avx2")]`, called after the
    //! processor was found to support AVX2 (see `fly::Group::fly`).
    use super::Vf;
    use std::arch::x86_64::*;
    use std::ops::{Add, Div, Mul, Sub};

    #[derive(Clone, Copy)]
    #[repr(transparent)]
    pub struct F4(__m256d);

    macro_rules! binop {
        ($tr:ident, $f:ident, $intr:ident) => {
            impl $tr for F4 {
                type Output = F4;
                #[inline(always)]
                fn $f(self, o: F4) -> F4 {
                    // SAFETY: only reached from AVX2-enabled code on an AVX2 processor.
                    F4(unsafe { $intr(self.0, o.0) })
                }
            }
        };
    }
    binop!(Add, add, _mm256_add_pd);
    binop!(Sub, sub, _mm256_sub_pd);
    binop!(Mul, mul, _mm256_mul_pd);
    binop!(Div, div, _mm256_div_pd);

    impl Vf for F4 {
        const N: usize = 4;
        #[inline(always)]
        fn splat(x: f64) -> F4 {
            // SAFETY: as above.
            F4(unsafe { _mm256_set1_pd(x) })
        }
        #[inline(always)]
        fn load(a: &[f64], at: usize) -> F4 {
            let s = &a[at..at + 4];
            // SAFETY: `s` holds four f64; the load is unaligned.
            F4(unsafe { _mm256_loadu_pd(s.as_ptr()) })
        }
        #[inline(always)]
        fn store(self, a: &mut [f64], at: usize) {
            let s = &mut a[at..at + 4];
            // SAFETY: `s` holds four f64; the store is unaligned.
            unsafe { _mm256_storeu_pd(s.as_mut_ptr(), self.0) }
        }
        #[inline(always)]
        fn max(self, b: F4) -> F4 {
            // MAXPD returns the first operand where it is greater, else the second:
            // exactly `if a > b { a } else { b }`.
            F4(unsafe { _mm256_max_pd(self.0, b.0) })
        }
        #[inline(always)]
        fn min(self, b: F4) -> F4 {
            F4(unsafe { _mm256_min_pd(self.0, b.0) })
        }
        #[inline(always)]
        fn gt_or_zero(self, b: F4, then: F4) -> F4 {
            // SAFETY: as above. An ordered, quiet comparison: NaN compares false.
            F4(unsafe { _mm256_and_pd(_mm256_cmp_pd::<_CMP_GT_OQ>(self.0, b.0), then.0) })
        }
        #[inline(always)]
        fn first(self) -> f64 {
            // SAFETY: as above.
            unsafe { _mm256_cvtsd_f64(self.0) }
        }
    }
}
