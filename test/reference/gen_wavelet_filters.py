"""Writes src/engine/smoothers/wavelet/waveletFilters.ts: the scaling filters of
Daubechies' orthonormal wavelets, extremal phase (db1-db10) and least asymmetric
"symmlets" (sym4-sym10), to 17 significant digits, copied from PyWavelets'
tables (Debian python3-pywt; the version is written into the file). These are the
filters tabulated in I. Daubechies, "Ten Lectures on Wavelets", SIAM 1992,
Table 6.1 (extremal phase) and Table 6.3 (least asymmetric); PyWavelets' rec_lo
ordering is kept (h_0 .. h_{L-1}, summing to sqrt(2)).
Run with /usr/bin/python3 (see generate.sh).
"""
import pywt

HERE = __file__.rsplit('/', 1)[0] if '/' in __file__ else '.'
NAMES = [f'db{i}' for i in range(1, 11)] + [f'sym{i}' for i in range(4, 11)]

lines = [
    '/**',
    ' * Scaling filters h_0 .. h_{L-1} (sum sqrt(2), sum of squares 1) of Daubechies\'',
    ' * orthonormal wavelets: extremal phase "db1".."db10" (db1 is the Haar wavelet) and',
    ' * least asymmetric "sym4".."sym10" (symmlets). Source table: I. Daubechies, "Ten',
    ' * Lectures on Wavelets", SIAM 1992, Table 6.1 and Table 6.3; digits copied from',
    f' * PyWavelets {pywt.__version__} (Wavelet(name).rec_lo) by test/reference/gen_wavelet_filters.py.',
    ' * Generated file: do not edit by hand.',
    ' */',
    '',
    '/** Names of the available filters. */',
    'export const WAVELET_FILTER_NAMES = [' + ', '.join(f"'{n}'" for n in NAMES) + '] as const;',
    '',
    '/** One of {@link WAVELET_FILTER_NAMES}. */',
    'export type WaveletFilterName = (typeof WAVELET_FILTER_NAMES)[number];',
    '',
    '/** The scaling filter of each wavelet, h_0 .. h_{L-1}. */',
    'export const WAVELET_FILTERS: Readonly<Record<WaveletFilterName, readonly number[]>> = {',
]
for n in NAMES:
    h = pywt.Wavelet(n).rec_lo
    lines.append(f"  {n}: [{', '.join(repr(float(v)) for v in h)}],")
lines.append('};')
with open(f'{HERE}/../../src/engine/smoothers/wavelet/waveletFilters.ts', 'w') as f:
    f.write('\n'.join(lines) + '\n')
