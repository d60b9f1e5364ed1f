"""Reference fixtures for wavelet shrinkage.

Writes fixtures/wavelet_pywt.json with PyWavelets (Debian python3-pywt):
  dwt     pywt.wavedec(y, name, mode='periodization', level=J) for db4 and sym8 at
          J = pywt.dwt_max_level(N, filter length), on N = 1024 and N = 768 (= 3 * 2^8),
          coefficients concatenated coarsest first [cA_J, cD_J, ..., cD_1].
  visu    VisuShrink by hand from PyWavelets pieces: sigma = median(|cD_1|) / 0.6745,
          t = sigma * sqrt(2 log N), pywt.threshold(cD_j, t, 'soft' | 'hard') on every
          detail level, pywt.waverec(..., mode='periodization').
Signals: the Doppler and Blocks test functions of Donoho & Johnstone (1994), as
written in their paper (Table 1 / the WaveLab definitions), on t = (i + 0.5) / N,
scaled to sd 7 and plus seeded N(0, 1) noise (numpy default_rng(13)).
Run with /usr/bin/python3 (see generate.sh).
"""
import json

import numpy as np
import pywt

HERE = __file__.rsplit('/', 1)[0] if '/' in __file__ else '.'


def doppler(t):
    return np.sqrt(t * (1 - t)) * np.sin(2 * np.pi * 1.05 / (t + 0.05))


def blocks(t):
    pos = np.array([.1, .13, .15, .23, .25, .40, .44, .65, .76, .78, .81])
    hgt = np.array([4, -5, 3, -4, 5, -4.2, 2.1, 4.3, -3.1, 2.1, -4.2])
    return sum(h * (1 + np.sign(t - p)) / 2 for p, h in zip(pos, hgt))


def main():
    rng = np.random.default_rng(13)
    series, dwt, visu = [], [], []
    for N in [1024, 768]:
        t = (np.arange(N) + 0.5) / N
        for fname, f in [('doppler', doppler), ('blocks', blocks)]:
            s = f(t)
            s = 7 * s / np.std(s)
            y = s + rng.standard_normal(N)
            series.append({'n': N, 'signal': fname, 'y': y.tolist(), 'truth': s.tolist()})
            k = len(series) - 1
            for name in ['db4', 'sym8']:
                L = pywt.Wavelet(name).dec_len
                J = pywt.dwt_max_level(N, L)
                coeffs = pywt.wavedec(y, name, mode='periodization', level=J)
                dwt.append({'series': k, 'filter': name, 'levels': J,
                            'coefficients': np.concatenate(coeffs).tolist()})
                sigma = np.median(np.abs(coeffs[-1])) / 0.6745
                thr = sigma * np.sqrt(2 * np.log(N))
                for mode in ['soft', 'hard']:
                    shrunk = [coeffs[0]] + [pywt.threshold(c, thr, mode) for c in coeffs[1:]]
                    rec = pywt.waverec(shrunk, name, mode='periodization')
                    visu.append({'series': k, 'filter': name, 'levels': J, 'shrink': mode,
                                 'sigma': float(sigma), 'threshold': float(thr), 'fitted': rec.tolist()})
    out = {
        'source': 'PyWavelets wavedec / threshold / waverec, mode periodization',
        'versions': {'pywt': pywt.__version__, 'numpy': np.__version__},
        'parameters': {'seed': 13, 'noise_sd': 1, 'signal_sd': 7, 'lengths': [1024, 768]},
        'series': series,
        'dwt': dwt,
        'visu': visu,
    }
    with open(f'{HERE}/fixtures/wavelet_pywt.json', 'w') as f:
        json.dump(out, f)


if __name__ == '__main__':
    main()
