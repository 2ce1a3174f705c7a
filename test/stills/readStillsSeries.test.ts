import { afterEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { copyFileSync, mkdirSync, writeFileSync } from 'node:fs';
import sharp from 'sharp';
import exifr from 'exifr';
import { Jimp } from 'jimp';
import { readStillsSeries } from '../../src/stills/readStillsSeries.js';
import { isKerrError } from '../../src/errors.js';
import { BEAM_ROI, CARD_ROI, DARK_ROI, H, W, tempFolder, write16, writeJpeg, writePng8 } from './stillsFixtures.js';

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

  it('8-bit PNG linearised by sRGB: a uniform code 128 reads 0.215861 (IEC 61966-2-1 check value)', async () => {
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
    const tif = await readStillsSeries(dir, {});
    expect(tif.bitDepths).toEqual([16]);
    expect(tif.transfers).toEqual(['linear']);
    expect(tif.roiLinear[0]).toBeCloseTo(0.2, 12);
    expect(tif.notes.join(' ')).toMatch(/read as linear/);
    const overridden = await readStillsSeries(dir, { transfer: 'srgb' });
    expect(overridden.roiLinear[0]).toBeCloseTo(Math.pow((0.2 + 0.055) / 1.055, 2.4), 5); // IEC 61966-2-1 decode of V = 0.2

    const dir2 = folder();
    const half = new Uint16Array(16 * 8 * 3).fill(32768); // V ≈ 0.5 → 0.214041 (IEC 61966-2-1)
    await write16(join(dir2, 'b_1kV.png'), half, 16, 8, 'png');
    const png = await readStillsSeries(dir2, {});
    expect(png.transfers).toEqual(['srgb']);
    expect(Math.abs(png.roiLinear[0]! - 0.214041)).toBeLessThan(2e-5);
  });

  it('region means agree with an independent decoder (jimp) within 0.5 code value', async () => {
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
    expect(s.warnings.join(' ')).toMatch(/1 photo\(s\) in the folder are not in .*map\.csv and were left out: IMG_0003\.jpg/);
    expect(s.leftOut.map((l) => l.file)).toContain('IMG_0003.jpg');
  });

  it('without EXIF, a reference region tracks exposure: warns that it varies and normalises by it', async () => {
    const dir = folder();
    await writePng8(join(dir, 's1_0V.png'), { beam: 0.2, exposure: 1 });
    await writePng8(join(dir, 's2_0V.png'), { beam: 0.2, exposure: 1.5 });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI, darkRoi: DARK_ROI, referenceRoi: CARD_ROI });
    expect(s.exposureBasis).toBe('reference');
    expect(s.exposureRelative[1]).toBeCloseTo(1.5, 2);
    expect(s.warnings.join(' ')).toMatch(/no exposure EXIF and the reference region changes by 50%: the exposure seems to vary/);
    expect(Math.abs(s.intensity[1]! / s.intensity[0]! - 1)).toBeLessThan(0.02);
  });

  it('without EXIF or reference region it says it cannot tell', async () => {
    const dir = folder();
    await writePng8(join(dir, '0V.png'), { beam: 0.2 });
    await writePng8(join(dir, '500V.png'), { beam: 0.3 });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI });
    expect(s.exposureBasis).toBe('none');
    expect(s.warnings.join(' ')).toMatch(/cannot tell whether the exposure changed/);
    expect(Array.from(s.voltageV)).toEqual([0, 500]);
  });

  it('counts clipped pixels and names clipped photos', async () => {
    const dir = folder();
    await writePng8(join(dir, '1kV.png'), { beam: 1.5 });
    const s = await readStillsSeries(dir, { roi: BEAM_ROI });
    expect(s.clippedFraction[0]).toBe(1);
    expect(s.warnings.join(' ')).toMatch(/1 photo\(s\) have more than 1% of the beam region clipped \(1kV\.png\)/);
  });

  describe('bad input: one clear line each', () => {
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
  });
});
