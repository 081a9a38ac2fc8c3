"""Number text for the LAS and CSV writers, vectorised with numpy.

:func:`format_fixed` writes fixed-point text of a float column (``"%.{d}f"``
without exponents) with integer arithmetic in numpy instead of one Python format
call per value; values whose rounding is a tie to within the float resolution are
formatted by Python's own ``%`` operator, so the text is the same as ``"%.{d}f" % x``.
:func:`format_general` does the same for ``"%.{p}g"``; :func:`csv_rows` joins
such columns into CSV lines.
"""

from __future__ import annotations

import numpy as np

__all__ = ["format_fixed", "format_general", "csv_rows", "FIXED_MAX"]

#: Largest magnitude of a value times 10**decimals formatted with integers.
FIXED_MAX = float(2 ** 40)

_SPACE, _MINUS, _DOT = ord(" "), ord("-"), ord(".")


def _digits(mag: np.ndarray, count: int):
    """The ``count`` lowest decimal digits of each non-negative integer, last digit first, as
    ASCII codes in an integer array (the caller stores them as bytes).

    One ``m // 10`` and ``m - 10 q`` per digit, in 32-bit integers when every magnitude
    fits: measured about 2.5 times faster than two digits at a time through a table of
    digit pairs in 64-bit integers, and several times faster than ``np.divmod``.
    """
    m = mag.astype(np.uint32) if mag.size and int(mag.max()) < 2 ** 32 else mag
    ten, zero = m.dtype.type(10), m.dtype.type(ord("0"))
    for _ in range(count):
        q = m // ten
        d = m - q * ten
        d += zero
        m = q
        yield d


def _magnitudes(x: np.ndarray, decimals: int):
    """``(finite, slow, mag, neg)`` of :func:`format_fixed`: the rows formatted by Python's
    ``%`` (too large, or a rounding tie), the rounded ``|x| * 10**decimals`` of the others
    (0 for the rest) and the rows written with a minus sign.

    Computed in place where it can: every temporary of a long column is a pass over
    fresh memory.
    """
    finite = np.isfinite(x)
    scale = 10.0 ** decimals
    all_finite = bool(finite.all())
    with np.errstate(invalid="ignore", over="ignore"):
        p = np.abs(x)
        p *= scale
        if not all_finite:
            p[~finite] = 0.0
        fast = p < FIXED_MAX
        frac = np.floor(p)
        np.subtract(p, frac, out=frac)
        frac -= 0.5
        np.abs(frac, out=frac)
        # exact product and rounded product differ by at most half an ulp of p
        tie = frac <= p * 2.3e-16
    del frac
    slow = finite & (~fast | tie)
    if slow.any():
        p[slow] = 0.0
    mag = np.rint(p, out=p).astype(np.int64)
    del p
    neg = np.signbit(x)
    if not all_finite:
        neg &= finite
    return finite, slow, mag, neg


def format_fixed(values: np.ndarray, decimals: int, null_text: str) -> np.ndarray:
    """Fixed-point text of each value, right-aligned, as a ``(n, width)`` uint8 array.

    Each row holds the ASCII text of ``"%.{decimals}f" % x`` (``null_text`` where
    ``x`` is not finite), padded on the left with blanks to the longest text of
    the column. ``width`` is that longest length.

    Values with ``|x| * 10**decimals < 2**40`` are formatted with integer
    arithmetic; ties and larger values go through Python's ``%`` operator, so the
    text equals ``"%.{decimals}f" % x`` for every value.
    """
    x = np.asarray(values, dtype=np.float64)
    n = x.size
    finite, slow, mag, neg = _magnitudes(x, decimals)
    all_finite, any_slow = bool(finite.all()), bool(slow.any())

    # number of digits of the magnitude, at least decimals + 1 (a leading zero)
    n_digits = np.full(n, decimals + 1, dtype=np.int64)
    limit = 10 ** (decimals + 1)
    power = limit
    while True:
        more = mag >= power
        if not more.any():
            break
        n_digits += more
        power *= 10
    text_len = n_digits + (1 if decimals else 0)
    text_len += neg
    slow_text = [("%.*f" % (decimals, v)).encode("ascii") for v in x[slow].tolist()] if any_slow else []
    null_b = null_text.encode("ascii")
    width = 0
    if n:
        width = int(text_len.max() if all_finite and not any_slow
                    else text_len[finite & ~slow].max(initial=0))
        if slow_text:
            width = max(width, max(len(t) for t in slow_text))
        if not finite.all():
            width = max(width, len(null_b))
    # built column by column in a (width, n) array (each column one contiguous row of
    # it), returned as its (n, width) transposed view
    out_t = np.full((width, n), _SPACE, dtype=np.uint8)
    out = out_t.T
    if n == 0 or width == 0:
        return out
    # all digits from the right (leading zeros included), the decimal point before
    # the last `decimals` digits; then blanks over the leading zeros and the sign
    first = width - text_len                      # first column of each text
    col = width - 1
    full = width - int(text_len.min())            # columns from here on hold a digit in every row
    for d, digit in enumerate(_digits(mag, int(n_digits.max(initial=0)))):
        if col < 0:
            break
        out_t[col] = digit if col >= full else np.where(first <= col, digit, np.uint8(_SPACE))
        col -= 1
        if decimals and d == decimals - 1 and col >= 0:
            out_t[col] = _DOT
            col -= 1
    sel = np.flatnonzero(neg & ~slow if any_slow else neg)
    if sel.size:
        out[sel, first[sel]] = _MINUS
    # clear whatever the digit loop wrote into rows formatted otherwise
    other = ~finite | slow
    if other.any():
        out[other] = _SPACE
        if not finite.all():
            nb = np.frombuffer(null_b, dtype=np.uint8)
            if nb.size:
                out[np.ix_(np.flatnonzero(~finite), np.arange(width - nb.size, width))] = nb
        for r, t in zip(np.flatnonzero(slow).tolist(), slow_text):
            out[r, width - len(t):] = np.frombuffer(t, dtype=np.uint8)
    return out


def format_general(values: np.ndarray, precision: int = 10) -> np.ndarray:
    """Text of ``"%.{precision}g" % x`` for each value, as a ``(n, width)`` uint8 array.

    Each row holds the text right-aligned and padded with blanks on the left;
    NaN gives an empty text (all blanks). Values written in fixed notation by
    ``%g`` (decimal exponent from -4 to precision - 1) are formatted with
    :func:`format_fixed` at the decimals ``%g`` would use and their trailing zeros
    removed; a value is checked to carry exactly ``precision`` significant digits
    before that, and every value that does not (a rounding carry into the next
    power of ten, a logarithm off by one) or needs an exponent is formatted by
    Python's ``%`` operator itself. The text is therefore that of ``%`` for every
    value.
    """
    x = np.asarray(values, dtype=np.float64)
    n = x.size
    finite = np.isfinite(x)
    a = np.abs(np.where(finite, x, 1.0))
    with np.errstate(divide="ignore"):
        e0 = np.floor(np.log10(np.where(a > 0, a, 1.0))).astype(np.int64)
    fast = finite & (a > 0) & (e0 >= -4) & (e0 < precision)
    zero = finite & (a == 0)
    parts: list[tuple[np.ndarray, np.ndarray]] = []       # (rows, uint8 text matrix)
    slow_rows = [np.flatnonzero(~np.isnan(x) & ~fast & ~zero)]
    low, high = 10.0 ** (precision - 1), 10.0 ** precision
    for e in np.unique(e0[fast]).tolist():
        rows = np.flatnonzero(fast & (e0 == e))
        d = precision - 1 - e
        p = a[rows] * 10.0 ** d
        mag = np.rint(p)
        # exactly `precision` significant digits, and no rounding tie (see format_fixed)
        ok = (mag >= low) & (mag < high) & (np.abs(p - np.floor(p) - 0.5) > p * 2.3e-16)
        slow_rows.append(rows[~ok])
        rows = rows[ok]
        m = format_fixed(x[rows], d, "")
        if d > 0 and rows.size:
            # drop trailing zeros of the fraction, and the point if nothing is left
            nonzero = m[:, :-d - 1:-1] != ord("0")        # fraction digits, last one first
            n_zero = np.where(nonzero.any(axis=1), np.argmax(nonzero, axis=1), d)
            cut = m.shape[1] - n_zero - (n_zero == d)
            m[np.arange(m.shape[1])[None, :] >= cut[:, None]] = ord(" ")
        parts.append((rows, m))
    neg_zero = zero & np.signbit(x)
    slow = np.concatenate(slow_rows)
    texts = [("%.*g" % (precision, v)).encode("ascii") for v in x[slow].tolist()]
    width = max([m.shape[1] for _, m in parts] + [len(t) for t in texts]
                + [1 if zero.any() else 0, 2 if neg_zero.any() else 0])
    out = np.full((n, width), ord(" "), dtype=np.uint8)
    for rows, m in parts:
        if m.shape[1]:
            out[rows, width - m.shape[1]:] = m
    if width:
        out[zero, width - 1] = ord("0")               # "0", and "-0" for negative zero
    if width > 1:
        out[neg_zero, width - 2] = ord("-")
    for r, t in zip(slow.tolist(), texts):
        out[r, width - len(t):] = np.frombuffer(t, dtype=np.uint8)
    return out


def csv_rows(columns: list[np.ndarray], precision: int = 10, chunk: int = 65536):
    """Data lines of a CSV file, ``"%.{precision}g"`` numbers, empty cells for NaN.

    Yields ASCII bytes of whole lines (``a,b,c\\n``), ``chunk`` rows at a time (bytes:
    the caller writes them to a binary file without decoding and encoding again).
    """
    n = columns[0].size if columns else 0
    for a in range(0, n, chunk):
        b = min(n, a + chunk)
        cells = [format_general(c[a:b], precision) for c in columns]
        width = sum(m.shape[1] + 1 for m in cells)
        buf = np.empty((b - a, width), dtype=np.uint8)
        pos = 0
        for i, m in enumerate(cells):
            buf[:, pos:pos + m.shape[1]] = m
            pos += m.shape[1]
            buf[:, pos] = ord(",") if i < len(cells) - 1 else ord("\n")
            pos += 1
        flat = buf.ravel()
        yield flat[flat != ord(" ")].tobytes()
