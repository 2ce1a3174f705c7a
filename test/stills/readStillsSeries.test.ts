import { afterEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { copyFileSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import sharp from 'sharp';
import exifr from 'exifr';
import { Jimp } from 'jimp';
import { readStillsSeries } from '../../src/stills/readStillsSeries.js';
import { isKerrError } from '../../src/errors.js';
import { BEAM_ROI, CARD_ROI, DARK_ROI, H, W, tempFolder, write16, writeJpeg, writePng8 } from './stillsFixtures.js';
import { OUTSIDE } from '../setup/outsideSources.js';

let cleanups: Array<() => void> = [];
afterEach(() => {
  for (const c of cleanups) c();
  cleanups = [];
});
function folder(): string {
  const t = tempFolder();
  cleanups.push(t.cleanup);
  return t.dir;
}
async function errorOf(p: Promise<unknown>): Promise<{ code: string; line: string }> {
  try {
    await p;
  } catch (e) {
    if (isKerrError(e)) return { code: e.code, line: e.oneLine() };
    throw e;
  }
  throw new Error('expected a KerrError');
}

describe('readStillsSeries', () => {
  it('photo voltages in kV read as V (4.5, 9.0) are refused in one line that says kilovolts and how to write the unit (a liquid cell needs kilovolts; the same 50 V floor as a video log)', async () => {
    const dir = folder();
    for (const [k, v] of ['0', '4.5', '9.0'].entries()) await writePng8(join(dir, `s${k}_${v}V.png`), { beam: 0.1 + 0.1 * k });
    const byName = await errorOf(readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI }));
    expect(byName.code).toBe('BAD_ARGUMENT');
    expect(byName.line).toMatch(/never exceed 9 V.*kilovolts read as volts/);
    expect(byName.line).toMatch(/4\.5kV/);
    expect(byName.line).not.toMatch(/\n/);
    writeFileSync(join(dir, 'map.csv'), 'file,voltage\ns0_0V.png,0\ns1_4.5V.png,4.5\ns2_9.0V.png,9.0\n');
    const byMap = await errorOf(readStillsSeries(dir, { voltsPath: join(dir, 'map.csv'), roi: BEAM_ROI, darkRoi: DARK_ROI }));
    expect(byMap.line).toMatch(/kilovolts read as volts.*voltage_kV/);
    // the same voltages with their unit pass the check
    writeFileSync(join(dir, 'map.csv'), 'file,voltage_kV\ns0_0V.png,0\ns1_4.5V.png,4.5\ns2_9.0V.png,9.0\n');
    const ok = await readStillsSeries(dir, { voltsPath: join(dir, 'map.csv'), roi: BEAM_ROI, darkRoi: DARK_ROI });
    expect(Array.from(ok.voltageV)).toEqual([0, 4500, 9000]);
  });

  it('EXIF normalisation: the same scene at different exposure time, ISO and f-number gives the same intensity within 2% (exposure ∝ t·ISO/N², common practice)', async () => {
    const dir = folder();
    const shots = [
      { name: 'p1_0V.jpg', exposure: 1, exif: { exposureTime: '1/100', iso: '100', fNumber: '2.8' } },
      { name: 'p2_0V.jpg', exposure: 2, exif: { exposureTime: '1/50', iso: '100', fNumber: '2.8' } },
      { name: 'p3_0V.jpg', exposure: 2 * (2.8 / 4) ** 2, exif: { exposureTime: '1/100', iso: '200', fNumber: '4' } },
    ];
    for (const s of shots) await writeJpeg(join(dir, s.name), { beam: 0.3, exposure: s.exposure, black: 0.01 }, s.exif);
    // exifr reads back what sharp wrote
    const back = await exifr.parse(join(dir, 'p2_0V.jpg'), { pick: ['ExposureTime', 'ISO', 'FNumber'] });
    expect(back).toMatchObject({ ExposureTime: 0.02, ISO: 100, FNumber: 2.8 });

    const s = await readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI });
    expect(s.exposureBasis).toBe('exif');
    expect(Array.from(s.exposureRelative)).toEqual([1, 2, expect.closeTo(0.98, 9)]);
    // raw ROI values really differ (the test is not vacuous)
    expect(s.roiLinear[1]! / s.roiLinear[0]!).toBeGreaterThan(1.8);
    // true dark-subtracted beam: 0.3 (beam radiance over the ambient) at the first photo's exposure
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(s.intensity[i]! / s.intensity[0]! - 1)).toBeLessThan(0.02);
      expect(Math.abs(s.intensity[i]! - 0.3) / 0.3).toBeLessThan(0.02);
    }
    expect(s.files).toEqual(['p1_0V.jpg', 'p2_0V.jpg', 'p3_0V.jpg']);
    expect(s.width).toBe(W);
    expect(s.height).toBe(H);
  });

  it('8-bit PNG linearised by sRGB: a uniform code 128 reads 0.215861 (IEC 61966-2-1 check value)', { tags: [OUTSIDE.srgb] }, async () => {
    const dir = folder();
    await sharp({ create: { width: 32, height: 24, channels: 3, background: { r: 128, g: 128, b: 128 } } }).png().toFile(join(dir, '100V.png'));
    const s = await readStillsSeries(dir, { roi: { x: 4, y: 4, w: 10, h: 10 } });
    expect(s.roiLinear[0]).toBeCloseTo(0.215861, 6);
    expect(s.transfers).toEqual(['srgb']);
    expect(s.voltageV[0]).toBe(100);
  });

  it('16-bit TIFF is read as linear by default, 16-bit PNG as sRGB; --transfer overrides', async () => {
    const dir = folder();
    const codes = new Uint16Array(16 * 8 * 3).fill(13107); // 0.2 of full scale
    await write16(join(dir, 'a_1kV.tif'), codes, 16, 8, 'tiff');
    // One photo: nothing varies across it, so the beam is given (the whole 16×8 picture).
    const whole = { roi: { x: 0, y: 0, w: 16, h: 8 } };
    const tif = await readStillsSeries(dir, whole);
    expect(tif.bitDepths).toEqual([16]);
    expect(tif.transfers).toEqual(['linear']);
    expect(tif.roiLinear[0]).toBeCloseTo(0.2, 12);
    expect(tif.notes.join(' ')).toMatch(/read as linear/);
    const overridden = await readStillsSeries(dir, { ...whole, transfer: 'srgb' });
    expect(overridden.roiLinear[0]).toBeCloseTo(Math.pow((0.2 + 0.055) / 1.055, 2.4), 5); // IEC 61966-2-1 decode of V = 0.2

    const dir2 = folder();
    const half = new Uint16Array(16 * 8 * 3).fill(32768); // V ≈ 0.5 → 0.214041 (IEC 61966-2-1)
    await write16(join(dir2, 'b_1kV.png'), half, 16, 8, 'png');
    const png = await readStillsSeries(dir2, whole);
    expect(png.transfers).toEqual(['srgb']);
    expect(Math.abs(png.roiLinear[0]! - 0.214041)).toBeLessThan(2e-5);
  });

  it('region means agree with an independent decoder (jimp) within 0.5 code value', { tags: [OUTSIDE.jimp] }, async () => {
    const dir = folder();
    await writeJpeg(join(dir, '2kV.jpg'), { beam: 0.25, noise: 0.05 });
    const roi = { x: 50, y: 40, w: 60, h: 35 };
    const s = await readStillsSeries(dir, { roi, transfer: 'linear' });
    const img = await Jimp.read(join(dir, '2kV.jpg'));
    let sum = 0;
    for (let y = roi.y; y < roi.y + roi.h; y++) {
      for (let x = roi.x; x < roi.x + roi.w; x++) {
        const i = (y * img.bitmap.width + x) * 4;
        sum += 0.2126 * img.bitmap.data[i]! + 0.7152 * img.bitmap.data[i + 1]! + 0.0722 * img.bitmap.data[i + 2]!;
      }
    }
    const jimpMeanCode = sum / (roi.w * roi.h);
    expect(Math.abs(s.roiLinear[0]! * 255 - jimpMeanCode)).toBeLessThan(0.5);
  });

  it('voltages from a CSV (kV column); photos not listed are left out with a warning', async () => {
    const dir = folder();
    for (const n of ['IMG_0001.jpg', 'IMG_0002.jpg', 'IMG_0003.jpg']) await writeJpeg(join(dir, n), { beam: 0.1 });
    writeFileSync(join(dir, 'map.csv'), 'file;U [kV]\nIMG_0002.JPG;1,5\nimg_0001;0\n');
    const s = await readStillsSeries(dir, { voltsPath: join(dir, 'map.csv'), roi: BEAM_ROI });
    expect(s.voltageSource).toBe('csv');
    expect(s.files).toEqual(['IMG_0001.jpg', 'IMG_0002.jpg']);
    expect(Array.from(s.voltageV)).toEqual([0, 1500]);
    expect(s.warnings.map((w) => w.message).join(' ')).toMatch(/1 photo\(s\) in the folder are not in .*map\.csv and were left out: IMG_0003\.jpg/);
    expect(s.leftOut.map((l) => l.file)).toContain('IMG_0003.jpg');
  });

  it('without EXIF, a reference region tracks exposure: warns that it varies and normalises by it', async () => {
    const dir = folder();
    await writePng8(join(dir, 's1_0V.png'), { beam: 0.2, exposure: 1 });
    await writePng8(join(dir, 's2_0V.png'), { beam: 0.2, exposure: 1.5 });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI, referenceRoi: CARD_ROI });
    expect(s.exposureBasis).toBe('reference');
    expect(s.exposureRelative[1]).toBeCloseTo(1.5, 2);
    expect(s.warnings.map((w) => w.message).join(' ')).toMatch(/no exposure EXIF and the reference region changes by 50%: the exposure seems to vary/);
    expect(s.warnings.find((w) => w.code === 'exposure-drift')?.guideSection).toBe('lock-exposure');
    expect(Math.abs(s.intensity[1]! / s.intensity[0]! - 1)).toBeLessThan(0.02);
  });

  it('without EXIF or reference region it says it cannot tell', async () => {
    const dir = folder();
    await writePng8(join(dir, '0V.png'), { beam: 0.2 });
    await writePng8(join(dir, '500V.png'), { beam: 0.3 });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI });
    expect(s.exposureBasis).toBe('none');
    expect(s.warnings.map((w) => w.message).join(' ')).toMatch(/cannot tell whether the exposure changed/);
    expect(Array.from(s.voltageV)).toEqual([0, 500]);
  });

  it('counts clipped pixels and names clipped photos', async () => {
    const dir = folder();
    await writePng8(join(dir, '1kV.png'), { beam: 1.5 });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI });
    expect(s.clippedFraction[0]).toBe(1);
    expect(s.warnings.map((w) => w.message).join(' ')).toMatch(/1 photo\(s\) have more than 1% of the beam region clipped \(1kV\.png\)/);
    expect(s.warnings.find((w) => w.code === 'clipping')?.guideSection).toBe('avoid-clipping');
  });

  it('EXIF capture times become seconds after the earliest photo; without them captureTimeS is null', async () => {
    const dir = folder();
    await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.1 }, { exposureTime: '1/60', dateTimeOriginal: '2024:05:17 14:00:58', subSecTimeOriginal: '50' });
    await writeJpeg(join(dir, 'b_1kV.jpg'), { beam: 0.1 }, { exposureTime: '1/60', dateTimeOriginal: '2024:05:17 14:01:03', subSecTimeOriginal: '75' });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI });
    expect(Array.from(s.captureTimeS!)).toEqual([0, expect.closeTo(5.25, 9)]);
    expect(s.warnings.map((w) => w.code)).not.toContain('capture-order');
    await writeJpeg(join(dir, 'c_2kV.jpg'), { beam: 0.1 }, { exposureTime: '1/60' });
    expect((await readStillsSeries(dir, { roi: BEAM_ROI })).captureTimeS).toBeNull();
  });

  it('capture times that run against the name order are warned about', async () => {
    const dir = folder();
    await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.1 }, { dateTimeOriginal: '2024:05:17 14:01:00' });
    await writeJpeg(join(dir, 'b_1kV.jpg'), { beam: 0.1 }, { dateTimeOriginal: '2024:05:17 14:00:00' });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI });
    expect(s.warnings.find((w) => w.code === 'capture-order')?.message).toMatch(/b_1kV\.jpg was taken before a_0V\.jpg/);
  });

  it('an unreadable photo (cut-short JPEG) is skipped and counted, not fatal; the first readable photo is the exposure reference', async () => {
    const dir = folder();
    await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.1 }, { exposureTime: '1/60' });
    await writeJpeg(join(dir, 'b_1kV.jpg'), { beam: 0.2, exposure: 2 }, { exposureTime: '1/30' });
    await writeJpeg(join(dir, 'c_2kV.jpg'), { beam: 0.3 }, { exposureTime: '1/60' });
    const whole = readFileSync(join(dir, 'a_0V.jpg'));
    writeFileSync(join(dir, 'a_0V.jpg'), whole.subarray(0, Math.floor(whole.length / 2))); // a copy cut short
    const s = await readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI });
    expect(s.unreadable[0]).toMatch(/\S/);
    expect(s.unreadable.slice(1)).toEqual([null, null]);
    expect(Number.isNaN(s.intensity[0]!)).toBe(true);
    expect(s.bitDepths[0]).toBeNull();
    expect(Array.from(s.exposureRelative.slice(1))).toEqual([1, 0.5]);
    expect(Math.abs(s.intensity[1]! - 0.4)).toBeLessThan(0.01); // 0.2 at twice the first readable photo's exposure
    expect(s.warnings.find((w) => w.code === 'unreadable')?.message).toMatch(/^a_0V\.jpg could not be read and was left out \(.+\); re-export it/);
  });

  describe('open photo (analyser parallel, no field)', () => {
    it('is measured like the series and put on its exposure scale by EXIF: the open level comes out whatever exposure it was shot at', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.02, black: 0.005 }, { exposureTime: '1/60', iso: '100', fNumber: '2' });
      await writeJpeg(join(dir, 'b_5kV.jpg'), { beam: 0.1, black: 0.005 }, { exposureTime: '1/60', iso: '100', fNumber: '2' });
      const other = folder();
      // 0.9 of open light would clip at the series' exposure; shot at a quarter of it (1/240 s)
      await writeJpeg(join(other, 'open.jpg'), { beam: 0.9, exposure: 0.25, black: 0.005 }, { exposureTime: '1/240', iso: '100', fNumber: '2' });
      const s = await readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI, openPhotoPath: join(other, 'open.jpg') });
      expect(s.openPhoto!.exposureRelative).toBeCloseTo(0.25, 9);
      expect(Math.abs(s.openPhoto!.intensity / 0.9 - 1)).toBeLessThan(0.02);
      expect(s.openPhoto!.clippedFraction).toBe(0);
    });

    it('with a reference region instead of EXIF, the grey card relates the exposures', async () => {
      const dir = folder();
      await writePng8(join(dir, 'a_0V.png'), { beam: 0.02 });
      await writePng8(join(dir, 'b_5kV.png'), { beam: 0.1, exposure: 1.2 });
      const other = folder();
      await writePng8(join(other, 'open.png'), { beam: 0.8, exposure: 0.5 });
      const s = await readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI, referenceRoi: CARD_ROI, openPhotoPath: join(other, 'open.png') });
      expect(s.exposureBasis).toBe('reference');
      expect(s.openPhoto!.exposureRelative).toBeCloseTo(0.5, 2);
      expect(Math.abs(s.openPhoto!.intensity / 0.8 - 1)).toBeLessThan(0.02);
    });

    it('refuses a clipped open photo, one of another size, one without the EXIF the series uses, and one of the series itself', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.02 }, { exposureTime: '1/60' });
      await writeJpeg(join(dir, 'b_5kV.jpg'), { beam: 0.1 }, { exposureTime: '1/60' });
      const other = folder();
      await writeJpeg(join(other, 'bright.jpg'), { beam: 1.5 }, { exposureTime: '1/60' });
      await writeJpeg(join(other, 'small.jpg'), { beam: 0.5, width: 80, height: 60 }, { exposureTime: '1/60' });
      await writeJpeg(join(other, 'noexif.jpg'), { beam: 0.5 });
      const open = (file: string) => errorOf(readStillsSeries(dir, { roi: BEAM_ROI, openPhotoPath: file }));
      expect((await open(join(other, 'bright.jpg'))).line).toMatch(/100% of the beam region of the open photo is clipped, so the open level would read low\. Take the open photo at a shorter exposure time/);
      expect((await open(join(other, 'small.jpg'))).line).toMatch(/the open photo is 80x60 but the series is 160x120/);
      expect((await open(join(other, 'noexif.jpg'))).line).toMatch(/the open photo carries no exposure time in its EXIF, but the series was normalised by EXIF/);
      expect((await open(join(dir, 'b_5kV.jpg'))).line).toMatch(/the open photo b_5kV\.jpg is also one of the series' photos/);
      expect((await open(join(other, 'missing.jpg'))).code).toBe('FILE_NOT_FOUND');
    });
  });

  describe('bad input: one clear line each', () => {
    it('no photo can be read', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.1 });
      writeFileSync(join(dir, 'a_0V.jpg'), readFileSync(join(dir, 'a_0V.jpg')).subarray(0, 40));
      const e = await errorOf(readStillsSeries(dir));
      expect(e.line).toMatch(/none of the 1 photo\(s\) in .* could be read \(a_0V\.jpg: .*\)\. Re-export the photos/);
    });

    it('a folder with no images', async () => {
      const dir = folder();
      writeFileSync(join(dir, 'volts.csv'), 'file,voltage\n');
      const e = await errorOf(readStillsSeries(dir));
      expect(e.line).toMatch(/no JPEG, PNG or TIFF photos in .* \(found only: volts\.csv\)\. Put the photos/);
    });

    it('a folder that does not exist', async () => {
      const e = await errorOf(readStillsSeries(join(folder(), 'nope')));
      expect(e.code).toBe('FILE_NOT_FOUND');
    });

    it('images of different sizes', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'a_0V.jpg'), { beam: 0.1 });
      await writeJpeg(join(dir, 'b_1kV.jpg'), { beam: 0.1, width: 120, height: 160 });
      const e = await errorOf(readStillsSeries(dir));
      expect(e.line).toMatch(/the photos differ in size: a_0V\.jpg is 160x120 but b_1kV\.jpg is 120x160\. Take the whole series/);
    });

    it('a mapping that names missing files', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'a.jpg'), { beam: 0.1 });
      writeFileSync(join(dir, 'm.csv'), 'file,voltage\na.jpg,0\nb.jpg,100\nc.jpg,200\n');
      const e = await errorOf(readStillsSeries(dir, { voltsPath: join(dir, 'm.csv') }));
      expect(e.code).toBe('BAD_CSV');
      expect(e.line).toMatch(/names 2 photos not found in the folder: b\.jpg, c\.jpg\. The file column must hold/);
    });

    it('a voltage given twice with different values for the same file', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'a.jpg'), { beam: 0.1 });
      writeFileSync(join(dir, 'm.csv'), 'file,voltage_kV\na.jpg,1\na.jpg,2\n');
      const e = await errorOf(readStillsSeries(dir, { voltsPath: join(dir, 'm.csv') }));
      expect(e.line).toMatch(/a\.jpg is given two different voltages, 1000 V \(line 2\) and 2000 V \(line 3\)/);
    });

    it('file names without a voltage and no CSV', async () => {
      const dir = folder();
      await writeJpeg(join(dir, 'IMG_0001.jpg'), { beam: 0.1 });
      const e = await errorOf(readStillsSeries(dir));
      expect(e.line).toMatch(/no voltage in the file name of IMG_0001\.jpg\. Name the photos with their voltage .* or give a CSV with --volts/);
    });

    it('HEIC photos are refused with how to convert them; beside a JPEG of the same name they are skipped', async () => {
      const dir = folder();
      await sharp({ create: { width: 16, height: 16, channels: 3, background: '#808080' } }).heif({ compression: 'av1' }).toFile(join(dir, 'IMG_0001_5kV.HEIC'));
      const e = await errorOf(readStillsSeries(dir));
      expect(e.line).toMatch(/IMG_0001_5kV\.HEIC is a HEIC\/HEIF photo, which kerrtrace does not read\. .*export the photos as JPEG/);
      await writeJpeg(join(dir, 'IMG_0001_5kV.jpg'), { beam: 0.1 });
      const s = await readStillsSeries(dir, { roi: BEAM_ROI });
      expect(s.files).toEqual(['IMG_0001_5kV.jpg']);
      expect(s.leftOut[0]!.file).toBe('IMG_0001_5kV.HEIC');
    });

    it('a phone HEIC (ftyp brand heic) behind a .jpg name is refused too', async () => {
      const dir = folder();
      // ISO/IEC 23008-12 file start: size 24, "ftyp", major brand "heic", minor 0, compatible "mif1" "heic"
      const head = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic', 'latin1'), Buffer.from([0, 0, 0, 0]), Buffer.from('mif1heic', 'latin1'), Buffer.alloc(64)]);
      writeFileSync(join(dir, 'IMG_0042_3kV.jpg'), head);
      const e = await errorOf(readStillsSeries(dir));
      expect(e.line).toMatch(/IMG_0042_3kV\.jpg is a HEIC\/HEIF photo/);
    });

    it('HEIF (AVIF-coded, as sharp writes it) content behind a .jpg name is refused too', async () => {
      const dir = folder();
      await sharp({ create: { width: 16, height: 16, channels: 3, background: '#808080' } }).heif({ compression: 'av1' }).toFile(join(dir, 'x.heic'));
      mkdirSync(join(dir, 'sub'));
      copyFileSync(join(dir, 'x.heic'), join(dir, 'sub', 'disguised_1kV.jpg'));
      const e = await errorOf(readStillsSeries(join(dir, 'sub')));
      expect(e.line).toMatch(/disguised_1kV\.jpg is a HEIC\/HEIF photo/);
    });

    it('a region outside the photo', async () => {
      const dir = folder();
      await writeJpeg(join(dir, '0V.jpg'), { beam: 0.1 });
      const e = await errorOf(readStillsSeries(dir, { roi: { x: 150, y: 0, w: 20, h: 10 } }));
      expect(e.code).toBe('BAD_REGION');
      expect(e.line).toMatch(/--roi reaches x = 170, outside the 160x120 frame/);
    });

    it('a dark region on the beam (given or found) is refused: it would subtract signal', async () => {
      const dir = folder();
      for (const [k, v] of [0, 2000, 4000, 6000, 8000, 10000].entries()) await writeJpeg(join(dir, `p${k}_${v}V.jpg`), { beam: 0.05 + 0.05 * k });
      const onBeam = { x: 70, y: 50, w: 10, h: 10 };
      const given = await errorOf(readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: onBeam }));
      expect(given.code).toBe('BAD_REGION');
      expect(given.line).toMatch(/the dark region 70,50,10,10 overlaps the beam region/);
      const found = await errorOf(readStillsSeries(dir, { darkRoi: onBeam }));
      expect(found.line).toMatch(/the dark region 70,50,10,10 overlaps the beam region \(found automatically\)/);
    });
  });
});
