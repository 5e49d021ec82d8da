#!/usr/bin/python3
"""Reference FITS files and values for lineshift's FITS reader and writer, made with astropy.

Run with Debian's Python (astropy 5.2.1, numpy 1.24.2), from the repository root:

    /usr/bin/python3 test/reference/make_fits_fixtures.py
        writes test/fixtures/fits/*.fits and test/fixtures/fits/expected.json

    /usr/bin/python3 test/reference/make_fits_fixtures.py --read-back FILE...
        reads FITS files written by lineshift and prints, as JSON on stdout, what astropy
        finds in them: data, WCS wavelengths, header cards and checksum verification.

Every fixture is small (100 pixels or fewer). Fluxes are recorded exactly as the hex of
big-endian float64 values; wavelengths are computed by astropy.wcs (images) or read from
astropy table columns (binary tables) and converted to angstrom with astropy.units.
"""
import datetime
import json
import math
import os
import struct
import sys
import warnings

import numpy as np
import astropy
from astropy import units as u
from astropy.io import fits
from astropy.table import Table
from astropy.wcs import WCS, FITSFixedWarning

# astropy.wcs notes that it derives MJD-OBS from DATE-OBS; that does not touch the spectral axis.
warnings.simplefilter('ignore', FITSFixedWarning)

N = 100
OUT = os.path.join('test', 'fixtures', 'fits')


def hex64(values):
    """Hex of big-endian float64, exact (NaN payloads normalised to the canonical NaN)."""
    out = []
    for v in np.asarray(values, dtype=np.float64).ravel():
        out.append('7ff8000000000000' if math.isnan(v) else struct.pack('>d', float(v)).hex())
    return out


def card_json(card):
    """(keyword, value, comment) of an astropy card in JSON-friendly form."""
    v = card.value
    if isinstance(v, fits.card.Undefined):
        jv = None
    elif isinstance(v, bool) or isinstance(v, np.bool_):
        jv = bool(v)
    elif isinstance(v, (int, np.integer)):
        jv = int(v) if abs(int(v)) <= 2**53 else str(int(v))
    elif isinstance(v, float):
        jv = {'real': repr(v)}
    elif isinstance(v, complex):
        jv = {'complex': [repr(v.real), repr(v.imag)]}
    else:
        jv = str(v)
    return [card.keyword, jv, card.comment]


def shape_flux(n, seed):
    """A smooth continuum with a few Gaussian lines; deterministic."""
    x = np.arange(n, dtype=np.float64)
    flux = 100.0 + 20.0 * np.sin(x / 13.0 + seed)
    for centre, depth in ((n * 0.3, -40.0), (n * 0.55, 60.0), (n * 0.8, -25.0)):
        flux += depth * np.exp(-0.5 * ((x - centre - seed) / 2.5) ** 2)
    return flux


def wcs_wavelengths(header, n):
    """Wavelengths in angstrom at 1-based pixels 1, (n+1)//2 and n, by astropy.wcs."""
    w = WCS(header).sub([1])
    pixels = np.array([1.0, float((n + 1) // 2), float(n)])
    world = w.wcs_pix2world(pixels, 1)[0]
    unit = str(w.wcs.cunit[0]) or 'Angstrom'
    call = f"WCS(header).sub([1]).wcs_pix2world([1, {(n + 1) // 2}, {n}], 1), unit {unit!r}"
    if header.get('DC-FLAG') == 1:
        world = 10.0 ** world
        call += ', then 10**x (DC-FLAG = 1)'
    return [float(v) for v in (world * u.Unit(unit)).to_value(u.AA)], pixels.tolist(), call


def medium_of(header):
    """Greisen et al. 2006 (Paper III): CTYPE1 WAVE = vacuum, AWAV = air; else unknown."""
    ctype = str(header.get('CTYPE1', '')).strip()
    if ctype.startswith('WAVE'):
        return 'vacuum'
    if ctype.startswith('AWAV'):
        return 'air'
    return None


def base_header(obj='LVAC-7', **cards):
    h = fits.Header()
    h['OBJECT'] = (obj, 'invented star (demo data)')
    h['DATE-OBS'] = ('2026-05-14T03:12:45.5', 'invented')
    for k, v in cards.items():
        h[k.replace('_', '-') if k == 'DATE_OBS' else k] = v
    return h


def linear_wcs(h, ctype, crval, cdelt, crpix=1.0, cunit='Angstrom'):
    if ctype is not None:
        h['CTYPE1'] = ctype
    if cunit is not None:
        h['CUNIT1'] = cunit
    h['CRVAL1'] = crval
    h['CDELT1'] = cdelt
    h['CRPIX1'] = crpix
    return h


def integer_image(name, raw, bscale, bzero, blank, header):
    header = header.copy()
    header['BSCALE'] = bscale
    header['BZERO'] = bzero
    if blank is not None:
        header['BLANK'] = blank
    hdu = fits.PrimaryHDU(data=raw, header=header, do_not_scale_image_data=True)
    hdu.writeto(os.path.join(OUT, name), overwrite=True)


def add_cards_before_end(path, hdu_index, cards):
    """Inserts cards before the END card of HDU hdu_index, using the blank cards after END."""
    data = bytearray(open(path, 'rb').read())
    offset = 0
    for i in range(hdu_index + 1):
        end = offset
        while data[end:end + 8] != b'END     ':
            end += 80
        header_len = ((end + 80 - offset + 2879) // 2880) * 2880
        if i < hdu_index:
            with fits.open(path) as hl:
                offset = hl[i + 1]._header_offset
    block_end = offset + header_len
    assert end + 80 * (len(cards) + 1) <= block_end, 'no room for the cards'
    insert = b''.join(c.ljust(80).encode('ascii') for c in cards)
    data[end:end + 80 + len(insert)] = insert + b'END'.ljust(80)
    open(path, 'wb').write(bytes(data))


def make_fixtures():
    os.makedirs(OUT, exist_ok=True)
    rng = np.random.RandomState(20260514)

    # BITPIX 8, 16, 32, 64 with BSCALE/BZERO and BLANK (FITS Standard 4.0 §4.4.2.5).
    raw8 = np.clip(np.round(shape_flux(N, 0.0)), 0, 254).astype(np.uint8)
    raw8[[5, 50]] = 255
    integer_image('bitpix8_scaled.fits', raw8, 2.0, -50.0, 255,
                  linear_wcs(base_header(), 'AWAV', 6500.0, 0.5))

    raw16 = np.round(shape_flux(N, 1.0) * 300 - 30000).astype('>i2')
    raw16[[0, 99]] = -32768
    integer_image('bitpix16_scaled_nm.fits', raw16, 0.25, 1000.0, -32768,
                  linear_wcs(base_header(), 'WAVE', 650.0, 0.05, cunit='nm'))

    raw32 = np.round(shape_flux(N, 2.0) * 1e6).astype('>i4')
    raw32[[17]] = -2147483648
    integer_image('bitpix32_pixel_axis.fits', raw32, 1e-3, 5.0, -2147483648, base_header())

    raw64 = (np.round(shape_flux(N, 3.0) * 1e12)).astype('>i8')
    raw64[[3, 4]] = -1
    h = base_header()
    h['CTYPE1'] = 'WAVE'
    h['CUNIT1'] = 'Angstrom'
    h['CRVAL1'] = 4861.0
    h['CD1_1'] = 0.125
    h['CRPIX1'] = 10.5
    integer_image('bitpix64_cd_matrix.fits', raw64, 0.5, 10.0, -1, h)

    # Unsigned 16-bit integers through BZERO = 32768 (astropy writes them with uint=True).
    u16 = np.round(shape_flux(N, 4.0) * 500).astype(np.uint16)
    h = base_header()
    h['CUNIT1'] = 'Angstrom'
    h['CRVAL1'] = 5000.0
    h['CDELT1'] = 2.0
    h['CRPIX1'] = 1.0
    fits.PrimaryHDU(data=u16, header=h, uint=True).writeto(os.path.join(OUT, 'uint16_blank_ctype.fits'), overwrite=True)

    # Unsigned 64-bit integers through BZERO = 2^63, values beyond 2^53.
    u64 = (np.uint64(2**63) + (np.round(shape_flux(N, 5.0) * 1e15)).astype(np.uint64) * np.uint64(3)).astype(np.uint64)
    h = linear_wcs(base_header(), 'LINEAR', 3900.0, 1.0)
    fits.PrimaryHDU(data=u64, header=h, uint=True).writeto(os.path.join(OUT, 'uint64.fits'), overwrite=True)

    # Floating point with NaN, -LOG WCS (Greisen et al. 2006 eq. 5).
    f32 = shape_flux(N, 6.0).astype('>f4')
    f32[[10, 11, 12]] = np.nan
    h = linear_wcs(base_header(), 'WAVE-LOG', 4000.0, 0.8)
    fits.PrimaryHDU(data=f32, header=h).writeto(os.path.join(OUT, 'float32_log_wcs.fits'), overwrite=True)

    # float64, air wavelengths in metres.
    f64 = (shape_flux(N, 7.0) + rng.normal(0, 1, N)).astype('>f8')
    h = linear_wcs(base_header(), 'AWAV', 6.3e-7, 1.0e-11, crpix=50.0, cunit='m')
    fits.PrimaryHDU(data=f64, header=h).writeto(os.path.join(OUT, 'float64_metres.fits'), overwrite=True)

    # DC-FLAG = 1: log10 wavelengths with CTYPE1 = 'LINEAR' (older convention).
    h = base_header()
    h['CTYPE1'] = 'LINEAR'
    h['CRVAL1'] = 3.6
    h['CDELT1'] = 1.0e-4
    h['CRPIX1'] = 1.0
    h['DC-FLAG'] = 1
    h['WAT0_001'] = 'system=equispec'
    h['WAT1_001'] = 'wtype=linear label=Wavelength units=angstroms'
    fits.PrimaryHDU(data=shape_flux(N, 8.0).astype('>f4'), header=h).writeto(os.path.join(OUT, 'dcflag_log10.fits'), overwrite=True)

    # A 2-D image with one row (NAXIS2 = 1).
    h = linear_wcs(base_header(), 'AWAV', 5500.0, 0.75, crpix=1.0)
    fits.PrimaryHDU(data=shape_flux(N, 9.0).astype('>f4').reshape(1, N), header=h).writeto(os.path.join(OUT, 'single_row_2d.fits'), overwrite=True)

    # Spectrum in an IMAGE extension, with an ERROR extension; OBJECT in the data-less primary.
    prim = fits.PrimaryHDU(header=base_header())
    hf = linear_wcs(fits.Header(), 'AWAV', 6000.0, 0.4)
    hf['BUNIT'] = 'adu'
    flux = fits.ImageHDU(data=shape_flux(N, 10.0).astype('>f4'), header=hf, name='FLUX')
    err = fits.ImageHDU(data=(np.sqrt(np.abs(shape_flux(N, 10.0))) / 3).astype('>f4'), name='ERROR')
    fits.HDUList([prim, flux, err]).writeto(os.path.join(OUT, 'image_extension.fits'), overwrite=True)

    # Spectrum in HDU 2, after a 2-D image in HDU 1.
    prim = fits.PrimaryHDU(header=base_header())
    img = fits.ImageHDU(data=np.arange(30 * 20, dtype='>i2').reshape(20, 30), name='FRAME')
    spec = fits.ImageHDU(data=shape_flux(N, 11.0).astype('>f8'), header=linear_wcs(fits.Header(), 'WAVE', 4300.0, 1.5), name='SPECTRUM')
    fits.HDUList([prim, img, spec]).writeto(os.path.join(OUT, 'multi_hdu.fits'), overwrite=True)

    # A 2-D image that is not a spectrum.
    fits.PrimaryHDU(data=np.arange(40 * 30, dtype='>i2').reshape(30, 40), header=base_header()).writeto(os.path.join(OUT, 'image_2d.fits'), overwrite=True)

    # Binary table, one row per pixel: WAVELENGTH (Angstrom), FLUX, IVAR.
    wave = 6400.0 + 0.3 * np.arange(N)
    fl = shape_flux(N, 12.0)
    ivar = 1.0 / (0.5 + 0.01 * np.arange(N)) ** 2
    ivar[7] = 0.0
    t = fits.BinTableHDU.from_columns([
        fits.Column(name='WAVELENGTH', format='D', unit='Angstrom', array=wave),
        fits.Column(name='FLUX', format='E', unit='erg/(s cm2 Angstrom)', array=fl.astype(np.float32)),
        fits.Column(name='IVAR', format='E', array=ivar.astype(np.float32)),
    ], name='SPECTRUM')
    t.header['AIRORVAC'] = 'air'
    fits.HDUList([fits.PrimaryHDU(header=base_header()), t]).writeto(os.path.join(OUT, 'table_rows.fits'), overwrite=True)

    # Binary table, one row of vector columns: LOGLAM (log10 Angstrom), FLUX, ERROR.
    loglam = 3.55 + 1e-4 * np.arange(N)
    t = fits.BinTableHDU.from_columns([
        fits.Column(name='loglam', format=f'{N}D', array=loglam.reshape(1, N)),
        fits.Column(name='flux', format=f'{N}E', array=shape_flux(N, 13.0).astype(np.float32).reshape(1, N)),
        fits.Column(name='error', format=f'{N}E', array=(0.1 + 0.001 * np.arange(N)).astype(np.float32).reshape(1, N)),
    ])
    t.header['VACUUM'] = True
    fits.HDUList([fits.PrimaryHDU(header=base_header()), t]).writeto(os.path.join(OUT, 'table_vector.fits'), overwrite=True)

    # Binary table with scaled integer flux (TSCAL/TZERO/TNULL) and a byte mask.
    raw = np.round((shape_flux(N, 14.0) - 100.0) * 100).astype(np.int16)
    raw[[20, 21]] = -999
    mask = np.zeros(N, dtype=np.uint8)
    mask[[30, 31, 32]] = 1
    t = fits.BinTableHDU.from_columns([
        fits.Column(name='WAVE', format='D', unit='nm', array=500.0 + 0.02 * np.arange(N)),
        fits.Column(name='FLUX', format='I', null=-999, array=raw),
        fits.Column(name='MASK', format='B', array=mask),
    ])
    fits.HDUList([fits.PrimaryHDU(header=base_header()), t]).writeto(os.path.join(OUT, 'table_scaled.fits'), overwrite=True)
    # astropy 5.2.1 fails to write a from_columns table with bscale on an int16 column, so the
    # raw integers are written and TSCAL2/TZERO2 are put into the header's spare cards.
    add_cards_before_end(os.path.join(OUT, 'table_scaled.fits'), 1, ['TSCAL2  =                 0.01', 'TZERO2  =                100.0'])
    with fits.open(os.path.join(OUT, 'table_scaled.fits'), do_not_scale_image_data=True) as hl:
        assert hl[1].header['TSCAL2'] == 0.01 and (hl[1].data.base['FLUX'] == raw).all()

    # Header card forms: CONTINUE, HIERARCH, D exponents, big integers, complex, undefined,
    # quotes, commentary, and keywords that are JavaScript object property names.
    cards = [
        "OBJECT  = 'LVAC-7'             / invented star",
        "OBSERVER= 'R. O''Kafor'        / quote inside a string (invented)",
        "EXPTIME =                1.5D2 / D exponent",
        "GAIN    =              2.5E-01 / E exponent",
        "BIGINT  =  1234567890123456789012 / beyond 2^53",
        "NEGINT  =                  -42",
        "FLAG    =                    T",
        "NOFLAG  =                    F",
        "NOVALUE =                      / undefined value",
        "CPLX    =           (1.5, -2.0) / complex value",
        "PADDED  = 'abc     '           / trailing blanks are not significant",
        "LEADING = '  lead'             / leading blanks are",
        "EMPTY   = ''                   / null string",
        "COMMENT This file is INVENTED test data for lineshift.",
        "HISTORY first history line",
        "        blank-keyword commentary",
        "HISTORY second history line",
        "HIERARCH LVAC DET CHIP NAME = 'Invented CCD' / HIERARCH card",
        "HIERARCH __proto__ = 1 / must not pollute anything",
        "HIERARCH constructor = 'x'",
        "TOSTRING= 'plain key'",
    ]
    h = fits.Header()
    for c in cards:
        h.append(fits.Card.fromstring(c.ljust(80)))
    h['LONGSTR'] = ('This is a long string value that does not fit on one card and so is continued '
                    'with the CONTINUE convention of FITS Standard 4.0 section 4.2.1.2 &c.',
                    'long comment')
    linear_wcs(h, 'WAVE', 6000.0, 1.0)
    with warnings.catch_warnings():
        warnings.simplefilter('ignore')
        fits.PrimaryHDU(data=shape_flux(N, 15.0).astype('>f4'), header=h).writeto(os.path.join(OUT, 'header_cards.fits'), overwrite=True)

    # CHECKSUM and DATASUM written by astropy (checksum=True), for our verifier.
    prim = fits.PrimaryHDU(data=shape_flux(N, 16.0).astype('>f4'), header=linear_wcs(base_header(), 'AWAV', 6000.0, 0.4))
    err = fits.ImageHDU(data=(np.sqrt(shape_flux(N, 16.0)) / 3).astype('>f4'), name='ERROR')
    fits.HDUList([prim, err]).writeto(os.path.join(OUT, 'checksum_astropy.fits'), overwrite=True, checksum=True)

    write_expected()


def image_expectation(name, hdu_index):
    path = os.path.join(OUT, name)
    with fits.open(path, do_not_scale_image_data=True) as hl:
        hdu = hl[hdu_index]
        hdr = hdu.header
        raw = np.asarray(hdu.data).ravel()
        n = raw.size
        bitpix = hdr['BITPIX']
        bscale = hdr.get('BSCALE', 1.0)
        bzero = hdr.get('BZERO', 0.0)
        if bitpix == 64 and bscale == 1 and bzero == 2**63:
            flux = (raw.astype(np.int64).view(np.uint64) ^ np.uint64(2**63)).astype(np.float64)
            flux_call = "raw int64 XOR 2**63 as uint64, .astype(float64) (unsigned 64-bit, BZERO = 2^63)"
        elif bitpix > 0:
            flux = raw.astype(np.float64) * bscale + bzero
            flux_call = "raw.astype(float64) * BSCALE + BZERO"
        else:
            flux = raw.astype(np.float64) * bscale + bzero if (bscale != 1 or bzero != 0) else raw.astype(np.float64)
            flux_call = "data.astype(float64)"
        if bitpix > 0 and 'BLANK' in hdr:
            flux[raw == hdr['BLANK']] = np.nan
            flux_call += "; pixels whose raw value equals BLANK set to NaN"
        exp = {
            'hdu': hdu_index,
            'pixels': int(n),
            'fluxHex': hex64(flux),
            'nanCount': int(np.isnan(flux).sum()),
            'fluxCall': f"fits.open(path, do_not_scale_image_data=True)[{hdu_index}].data; " + flux_call,
            'cards': [card_json(c) for c in hdr.cards],
        }
        if any(k in hdr for k in ('CRVAL1', 'CDELT1', 'CD1_1')):
            wl, pixels, call = wcs_wavelengths(hdr, n)
            exp.update(unit='angstrom', wavelengthAngstrom=wl, wavelengthPixels=pixels, wavelengthCall=call, medium=medium_of(hdr))
        else:
            exp.update(unit='pixel', medium=None, wavelengthCall='no WCS: lineshift gives the 0-based pixel index (not an astropy value)')
    # What astropy's own scaling gives (float32 for BITPIX 8/16), for the record.
    return exp


def table_expectation(name, hdu_index, wave_col, flux_col, err_col=None, err_kind='sigma', mask_col=None):
    path = os.path.join(OUT, name)
    t = Table.read(path, hdu=hdu_index)
    vector = len(t) == 1 and np.ndim(t[wave_col][0]) == 1
    def col(c):
        v = t[c][0] if vector else t[c]
        if hasattr(v, 'filled'):
            v = v.astype(np.float64).filled(np.nan)
        return np.asarray(v, dtype=np.float64)
    wave = col(wave_col)
    call = f"Table.read(path, hdu={hdu_index})['{wave_col}']" + ('[0]' if vector else '')
    if wave_col.lower() == 'loglam':
        wave = 10.0 ** wave
        call += ', then 10**x (log10 angstrom)'
    else:
        wave = (wave * t[wave_col].unit).to_value(u.AA)
        call += f', unit {str(t[wave_col].unit)!r} to angstrom'
    flux = col(flux_col)
    flux_call = f"Table.read(path, hdu={hdu_index})['{flux_col}'] (TSCAL/TZERO applied by astropy)"
    with fits.open(path) as hl:
        column = hl[hdu_index].columns[flux_col]
        if column.null is not None:
            # FITS Standard 4.0 §7.3.2: TNULLn is the stored integer that marks an undefined
            # value. astropy does not mask it in a scaled column, so it is applied here.
            stored = np.asarray(hl[hdu_index].data.base[flux_col]).ravel()
            flux = np.where(stored == column.null, np.nan, flux)
            flux_call += f'; NaN where the stored value equals TNULL = {column.null}'
    n = wave.size
    idx = [0, (n + 1) // 2 - 1, n - 1]
    with fits.open(path) as hl:
        cards = [card_json(c) for c in hl[hdu_index].header.cards]
    exp = {
        'hdu': hdu_index,
        'pixels': int(n),
        'fluxHex': hex64(flux),
        'nanCount': int(np.isnan(flux).sum()),
        'fluxCall': flux_call,
        'unit': 'angstrom',
        'wavelengthAngstrom': [float(wave[i]) for i in idx],
        'wavelengthPixels': [float(i + 1) for i in idx],
        'wavelengthCall': call,
        'cards': cards,
    }
    if err_col is not None:
        e = col(err_col)
        if err_kind == 'ivar':
            with np.errstate(divide='ignore'):
                e = 1.0 / np.sqrt(e)
        exp['uncertaintyHex'] = hex64(e)
        exp['uncertaintyCall'] = f"column {err_col}" + (' as 1/sqrt(ivar)' if err_kind == 'ivar' else '')
    if mask_col is not None:
        exp['mask'] = [int(x != 0) for x in col(mask_col)]
    return exp


def write_expected():
    files = {
        'bitpix8_scaled.fits': image_expectation('bitpix8_scaled.fits', 0),
        'bitpix16_scaled_nm.fits': image_expectation('bitpix16_scaled_nm.fits', 0),
        'bitpix32_pixel_axis.fits': image_expectation('bitpix32_pixel_axis.fits', 0),
        'bitpix64_cd_matrix.fits': image_expectation('bitpix64_cd_matrix.fits', 0),
        'uint16_blank_ctype.fits': image_expectation('uint16_blank_ctype.fits', 0),
        'uint64.fits': image_expectation('uint64.fits', 0),
        'float32_log_wcs.fits': image_expectation('float32_log_wcs.fits', 0),
        'float64_metres.fits': image_expectation('float64_metres.fits', 0),
        'dcflag_log10.fits': image_expectation('dcflag_log10.fits', 0),
        'single_row_2d.fits': image_expectation('single_row_2d.fits', 0),
        'image_extension.fits': image_expectation('image_extension.fits', 1),
        'multi_hdu.fits': image_expectation('multi_hdu.fits', 2),
        'header_cards.fits': image_expectation('header_cards.fits', 0),
        'table_rows.fits': table_expectation('table_rows.fits', 1, 'WAVELENGTH', 'FLUX', 'IVAR', 'ivar'),
        'table_vector.fits': table_expectation('table_vector.fits', 1, 'loglam', 'flux', 'error'),
        'table_scaled.fits': table_expectation('table_scaled.fits', 1, 'WAVE', 'FLUX', mask_col='MASK'),
    }
    # The image-extension fixture's uncertainty, from its ERROR extension.
    with fits.open(os.path.join(OUT, 'image_extension.fits')) as hl:
        files['image_extension.fits']['uncertaintyHex'] = hex64(hl['ERROR'].data.astype(np.float64))
        files['image_extension.fits']['uncertaintyCall'] = "fits.open(path)['ERROR'].data.astype(float64)"
    files['checksum_astropy.fits'] = image_expectation('checksum_astropy.fits', 0)
    with fits.open(os.path.join(OUT, 'checksum_astropy.fits'), checksum=True) as hl:
        files['checksum_astropy.fits']['checksums'] = [
            {'checksum': int(h.verify_checksum()), 'datasum': int(h.verify_datasum())} for h in hl]
        files['checksum_astropy.fits']['checksumCall'] = 'fits.open(path, checksum=True); hdu.verify_checksum(), hdu.verify_datasum() (1 = ok)'
    files['table_rows.fits']['medium'] = 'air'
    files['table_vector.fits']['medium'] = 'vacuum'
    files['table_scaled.fits']['medium'] = None
    with fits.open(os.path.join(OUT, 'image_2d.fits')) as hl:
        files['image_2d.fits'] = {'error': True, 'shapeNaxis': [hl[0].header['NAXIS1'], hl[0].header['NAXIS2']]}
    doc = {
        'generator': 'test/reference/make_fits_fixtures.py',
        'command': '/usr/bin/python3 test/reference/make_fits_fixtures.py',
        'astropy': astropy.__version__,
        'numpy': np.__version__,
        'python': sys.version.split()[0],
        'date': datetime.date.today().isoformat(),
        'notes': [
            'fluxHex: big-endian float64 hex of each pixel; NaN as 7ff8000000000000',
            'wavelengthAngstrom at 1-based pixels wavelengthPixels, computed by astropy.wcs (see wavelengthCall) or from table columns',
            'medium: Greisen et al. 2006 (A&A 446, 747): CTYPE1 WAVE = vacuum, AWAV = air; tables: AIRORVAC / VACUUM cards',
            'cards: [keyword, value, comment] as astropy reads them; reals as {"real": repr}, integers beyond 2^53 as strings',
        ],
        'files': files,
    }
    with open(os.path.join(OUT, 'expected.json'), 'w') as f:
        json.dump(doc, f, indent=1, sort_keys=True)
        f.write('\n')


def read_back(paths):
    """What astropy reads in files written by lineshift."""
    report = {'astropy': astropy.__version__, 'numpy': np.__version__, 'files': {}}
    for path in paths:
        entry = {}
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter('always')
            warnings.simplefilter('ignore', FITSFixedWarning)
            with fits.open(path, checksum=True) as hl:
                entry['hdus'] = []
                for hdu in hl:
                    entry['hdus'].append({
                        'name': hdu.name,
                        'verifyChecksum': int(hdu.verify_checksum()),
                        'verifyDatasum': int(hdu.verify_datasum()),
                        'cards': [card_json(c) for c in hdu.header.cards],
                    })
                if hl[0].header['NAXIS'] == 1:
                    hdr = hl[0].header
                    data = np.asarray(hl[0].data, dtype=np.float64)
                    n = data.size
                    entry['fluxHex'] = hex64(data)
                    if 'CRVAL1' in hdr:
                        w = WCS(hdr)
                        world = w.wcs_pix2world(np.arange(1, n + 1, dtype=np.float64), 1)[0]
                        unit = str(w.wcs.cunit[0])
                        if hdr.get('DC-FLAG') == 1:
                            world = 10.0 ** world
                        entry['wcsUnit'] = unit
                        entry['wavelength'] = [float(v) for v in world]
                    for ext in ('UNCERT', 'MASK'):
                        if ext in hl:
                            entry[ext.lower() + 'Hex'] = hex64(np.asarray(hl[ext].data, dtype=np.float64))
                else:
                    t = hl['SPECTRUM'].data
                    entry['fluxHex'] = hex64(np.asarray(t['FLUX'], dtype=np.float64))
                    entry['wavelength'] = [float(v) for v in np.asarray(t['WAVELENGTH'], dtype=np.float64)]
                    entry['wcsUnit'] = hl['SPECTRUM'].header.get('TUNIT1')
                    if 'UNCERTAINTY' in t.names:
                        entry['uncertHex'] = hex64(np.asarray(t['UNCERTAINTY'], dtype=np.float64))
        entry['warnings'] = [str(w.message) for w in caught]
        report['files'][path] = entry
    json.dump(report, sys.stdout)
    sys.stdout.write('\n')


if __name__ == '__main__':
    if len(sys.argv) > 1 and sys.argv[1] == '--read-back':
        read_back(sys.argv[2:])
    else:
        make_fixtures()
