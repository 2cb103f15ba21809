//! Splitting a batch over every core.
//!
//! A batch is a set of independent elements written into caller buffers. With
//! the `parallel` feature (on by default) a batch of at least
//! [`PARALLEL_MIN_LEN`] elements is split in halves recursively (rayon's
//! `join`, work stealing) down to pieces of [`GRAIN`] elements, and the pieces
//! run on rayon's global thread pool (its size: `RAYON_NUM_THREADS`, else one
//! thread per core). Each element is computed by the same code whatever the
//! split, so results are bit-for-bit identical to a one-thread run. Without the
//! feature, or for a status sink that cannot be split (a caller's own
//! [`StatusSink`]), the batch runs on the calling thread.
//!
//! Nothing here allocates: buffers are split with `split_at_mut`.

use crate::batch::{BatchReport, SinkSlots, StatusSink};
use crate::error::Status;

/// Elements per piece: a piece costs at least ~20 µs (20 ns per element for
/// the cheapest batches), far above rayon's per-task cost of well under 1 µs.
pub const GRAIN: usize = 2048;

/// Smallest batch that is split over threads (for the default grain).
pub const PARALLEL_MIN_LEN: usize = 2 * GRAIN;

/// Elements per piece for costly elements (multi-view solves, triangulations).
pub const COSTLY_GRAIN: usize = 32;

/// Buffers of a batch that can be cut at an element index (input slices,
/// output slices, optional outputs and tuples of them).
pub(crate) trait Parts: Send + Sized {
    /// The elements before `mid` and from `mid` on.
    fn split(self, mid: usize) -> (Self, Self);
}

impl<T: Sync> Parts for &[T] {
    #[inline]
    fn split(self, mid: usize) -> (Self, Self) {
        self.split_at(mid.min(self.len()))
    }
}

impl<T: Send> Parts for &mut [T] {
    #[inline]
    fn split(self, mid: usize) -> (Self, Self) {
        let mid = mid.min(self.len());
        self.split_at_mut(mid)
    }
}

impl<P: Parts> Parts for Option<P> {
    #[inline]
    fn split(self, mid: usize) -> (Self, Self) {
        match self {
            Some(p) => {
                let (a, b) = p.split(mid);
                (Some(a), Some(b))
            }
            None => (None, None),
        }
    }
}

impl<A: Parts, B: Parts> Parts for (A, B) {
    #[inline]
    fn split(self, mid: usize) -> (Self, Self) {
        let (a0, a1) = self.0.split(mid);
        let (b0, b1) = self.1.split(mid);
        ((a0, b0), (a1, b1))
    }
}

impl<A: Parts, B: Parts, C: Parts> Parts for (A, B, C) {
    #[inline]
    fn split(self, mid: usize) -> (Self, Self) {
        let (a0, a1) = self.0.split(mid);
        let (b0, b1) = self.1.split(mid);
        let (c0, c1) = self.2.split(mid);
        ((a0, b0, c0), (a1, b1, c1))
    }
}

/// A piece of a status sink, indexed from the start of its piece.
pub(crate) enum SinkPart<'a> {
    Statuses(&'a mut [Status]),
    Codes(&'a mut [i32]),
    Discard,
}

impl StatusSink for SinkPart<'_> {
    fn capacity(&self) -> Option<usize> {
        match self {
            SinkPart::Statuses(s) => Some(s.len()),
            SinkPart::Codes(c) => Some(c.len()),
            SinkPart::Discard => None,
        }
    }
    #[inline]
    fn record(&mut self, index: usize, status: Status) {
        match self {
            SinkPart::Statuses(s) => s.record(index, status),
            SinkPart::Codes(c) => c.record(index, status),
            SinkPart::Discard => {}
        }
    }
}

impl Parts for SinkPart<'_> {
    #[inline]
    fn split(self, mid: usize) -> (Self, Self) {
        match self {
            SinkPart::Statuses(s) => {
                let (a, b) = s.split(mid);
                (SinkPart::Statuses(a), SinkPart::Statuses(b))
            }
            SinkPart::Codes(c) => {
                let (a, b) = c.split(mid);
                (SinkPart::Codes(a), SinkPart::Codes(b))
            }
            SinkPart::Discard => (SinkPart::Discard, SinkPart::Discard),
        }
    }
}

/// Run `work` over `len` elements held in `parts`, recording statuses in
/// `status`.
///
/// `work(offset, piece, sink)` handles the elements `offset..offset + n` of one
/// piece: `piece` and `sink` are indexed from 0 at `offset`, and the returned
/// report names failures by their index in the whole batch.
pub(crate) fn run<P, S, W>(len: usize, parts: P, status: &mut S, work: W) -> BatchReport
where
    P: Parts,
    S: StatusSink + ?Sized,
    W: Fn(usize, P, &mut SinkPart<'_>) -> BatchReport + Sync,
{
    run_with_grain(GRAIN, len, parts, status, work)
}

/// [`run`] with pieces of `grain` elements: smaller for costly elements (a
/// multi-view solve takes ~10 µs, so 32 elements already outweigh rayon's
/// per-task cost).
pub(crate) fn run_with_grain<P, S, W>(
    grain: usize,
    len: usize,
    parts: P,
    status: &mut S,
    work: W,
) -> BatchReport
where
    P: Parts,
    S: StatusSink + ?Sized,
    W: Fn(usize, P, &mut SinkPart<'_>) -> BatchReport + Sync,
{
    let grain = grain.max(1);
    match status.slots() {
        SinkSlots::Statuses(s) => {
            let s = s.split(len).0;
            split_run(grain, 0, len, parts, SinkPart::Statuses(s), &work)
        }
        SinkSlots::Codes(c) => {
            let c = c.split(len).0;
            split_run(grain, 0, len, parts, SinkPart::Codes(c), &work)
        }
        SinkSlots::Discard => split_run(grain, 0, len, parts, SinkPart::Discard, &work),
        SinkSlots::Opaque => {
            // A sink of the caller's own type: run here, a piece at a time,
            // staging the statuses in a small local buffer.
            const STAGE: usize = 256;
            let mut stage = [Status::Ok; STAGE];
            let mut report = BatchReport::default();
            let mut rest = parts;
            let mut offset = 0;
            while offset < len {
                let n = (len - offset).min(STAGE);
                let (piece, tail) = rest.split(n);
                rest = tail;
                let staged = stage.get_mut(..n).unwrap_or(&mut []);
                let piece_report = work(offset, piece, &mut SinkPart::Statuses(staged));
                for (i, s) in staged.iter().enumerate() {
                    status.record(offset + i, *s);
                }
                report = report.merge(piece_report);
                offset += n;
            }
            report
        }
    }
}

fn split_run<P, W>(
    grain: usize,
    offset: usize,
    len: usize,
    parts: P,
    sink: SinkPart<'_>,
    work: &W,
) -> BatchReport
where
    P: Parts,
    W: Fn(usize, P, &mut SinkPart<'_>) -> BatchReport + Sync,
{
    #[cfg(feature = "parallel")]
    if len >= 2 * grain {
        let mid = len / 2;
        let (p0, p1) = parts.split(mid);
        let (s0, s1) = sink.split(mid);
        let (r0, r1) = rayon::join(
            || split_run(grain, offset, mid, p0, s0, work),
            || split_run(grain, offset + mid, len - mid, p1, s1, work),
        );
        return r0.merge(r1);
    }
    #[cfg(not(feature = "parallel"))]
    let _ = (grain, len);
    let mut sink = sink;
    work(offset, parts, &mut sink)
}

/// Run `each(i)` for the elements `0..n` of one piece, writing each success to
/// `out[i]` and each failure as `nan` plus its status; failures are reported
/// with their index in the whole batch (`offset + i`).
#[inline]
pub(crate) fn fill<T: Copy>(
    offset: usize,
    out: &mut [T],
    nan: T,
    sink: &mut SinkPart<'_>,
    each: impl Fn(usize) -> crate::Result<T>,
) -> BatchReport {
    let mut report = BatchReport::default();
    for (i, slot) in out.iter_mut().enumerate() {
        match each(i) {
            Ok(v) => {
                *slot = v;
                sink.record(i, Status::Ok);
            }
            Err(e) => {
                *slot = nan;
                sink.record(i, e.status());
                report.note(offset + i, e);
            }
        }
    }
    report
}

#[cfg(all(test, feature = "std"))]
mod tests {
    use super::*;
    use crate::error::Error;

    /// Elements fail at multiples of 1000; a large batch must report the same
    /// count, first failure and statuses whatever the sink and the split.
    fn batch<S: StatusSink + ?Sized>(
        n: usize,
        status: &mut S,
    ) -> (std::vec::Vec<f64>, BatchReport) {
        let input: std::vec::Vec<f64> = (0..n).map(|i| i as f64).collect();
        let mut out = std::vec![0.0; n];
        let report = run(
            n,
            (&input[..], &mut out[..]),
            status,
            |offset, (inp, out), sink| {
                fill(offset, out, f64::NAN, sink, |i| {
                    let x = inp[i];
                    if (x as usize) % 1000 == 999 {
                        Err(Error::WrongSide("test"))
                    } else {
                        Ok(x * 2.0)
                    }
                })
            },
        );
        (out, report)
    }

    struct Counting(usize);
    impl StatusSink for Counting {
        fn capacity(&self) -> Option<usize> {
            None
        }
        fn record(&mut self, _index: usize, status: Status) {
            if status != Status::Ok {
                self.0 += 1;
            }
        }
    }

    #[test]
    fn every_sink_sees_every_element() {
        let n = 50_000;
        let mut statuses = std::vec![Status::Internal; n];
        let (out, report) = batch(n, &mut statuses[..]);
        assert_eq!(report.failed, 50);
        assert_eq!(report.first_failure.map(|f| f.0), Some(999));
        assert!(out[999].is_nan() && out[1000] == 2000.0);
        assert_eq!(statuses[999], Status::WrongSide);
        assert!(statuses.iter().filter(|s| **s == Status::Ok).count() == n - 50);
        let mut codes = std::vec![-1i32; n];
        let (out2, report2) = batch(n, &mut codes[..]);
        assert_eq!(report2, report);
        assert_eq!(
            out2.iter()
                .map(|x| x.to_bits())
                .collect::<std::vec::Vec<_>>(),
            out.iter()
                .map(|x| x.to_bits())
                .collect::<std::vec::Vec<_>>()
        );
        assert!(codes.iter().zip(&statuses).all(|(c, s)| *c == s.code()));
        let (_, report3) = batch(n, &mut crate::batch::NoStatus);
        assert_eq!(report3, report);
        let mut counting = Counting(0);
        let (_, report4) = batch(n, &mut counting);
        assert_eq!(report4, report);
        assert_eq!(counting.0, 50);
    }
}
