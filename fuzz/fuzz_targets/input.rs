//! Turning fuzzer bytes into C ABI arguments, and the invariants every OK
//! result must satisfy. Shared by the fuzz targets (`#[path]`-included).
#![allow(dead_code)]

use flatray::capi::FlatrayStack;
use flatray::Vec3;

/// Reads arguments from the fuzzer's bytes; past the end it yields zeros.
pub struct Input<'a> {
    bytes: &'a [u8],
}

impl<'a> Input<'a> {
    pub fn new(bytes: &'a [u8]) -> Self {
        Input { bytes }
    }

    fn take<const N: usize>(&mut self) -> [u8; N] {
        let mut out = [0u8; N];
        let n = N.min(self.bytes.len());
        out[..n].copy_from_slice(&self.bytes[..n]);
        self.bytes = &self.bytes[n..];
        out
    }

    pub fn u8(&mut self) -> u8 {
        self.take::<1>()[0]
    }

    pub fn i32(&mut self) -> i32 {
        i32::from_le_bytes(self.take())
    }

    pub fn u32(&mut self) -> u32 {
        u32::from_le_bytes(self.take())
    }

    /// Any f64: a selector byte picks a special value (NaN, ±inf, ±0,
    /// subnormals, huge, tiny, ordinary indices and lengths) or raw bits, so
    /// both edge cases and plausible values come often.
    pub fn f64(&mut self) -> f64 {
        let selector = self.u8();
        let raw = f64::from_le_bytes(self.take());
        match selector % 16 {
            0 => f64::NAN,
            1 => f64::INFINITY,
            2 => f64::NEG_INFINITY,
            3 => 0.0,
            4 => -0.0,
            5 => f64::MIN_POSITIVE / 4.0,
            6 => f64::MAX,
            7 => 1e-300,
            8 => raw,
            // Plausible values: a small real number from the raw bits.
            _ => {
                let bits = raw.to_bits();
                let unit = (bits >> 11) as f64 / (1u64 << 53) as f64; // [0, 1)
                match selector % 4 {
                    0 => 1.0 + 1.5 * unit,          // refractive index-like
                    1 => unit * 2.0 - 1.0,          // direction component
                    2 => (unit - 0.5) * 200.0,      // coordinate, metres
                    _ => unit * 0.05,               // thickness-like
                }
            }
        }
    }

    pub fn vec3(&mut self) -> Vec3 {
        Vec3::new(self.f64(), self.f64(), self.f64())
    }

    pub fn stack(&mut self) -> FlatrayStack {
        let mut s = FlatrayStack {
            origin: self.vec3(),
            normal: self.vec3(),
            n_observer: self.f64(),
            // Mostly 0..=9 (9 is one too many), sometimes any u32.
            layer_count: match self.u8() {
                b if b < 250 => u32::from(b % 10),
                _ => self.u32(),
            },
            thickness: [0.0; 8],
            n_layer: [0.0; 8],
            n_object: self.f64(),
        };
        for i in 0..8 {
            s.thickness[i] = self.f64();
            s.n_layer[i] = self.f64();
        }
        s
    }
}

/// Defined status codes of the ABI.
pub fn defined(status: i32) -> bool {
    (0..=10).contains(&status)
}

/// A unit vector to within rounding.
pub fn is_unit(v: Vec3) -> bool {
    v.is_finite() && (v.length() - 1.0).abs() < 1e-12
}

pub fn is_nan3(v: Vec3) -> bool {
    v.x.is_nan() && v.y.is_nan() && v.z.is_nan()
}
