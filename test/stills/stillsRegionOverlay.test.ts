import { afterAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import sharp from 'sharp';
import { overlayPhotoIndex, stillsOverlayRegions, stillsRegionOverlay } from '../../src/stills/stillsRegionOverlay.js';
import { readStillsSeries } from '../../src/stills/readStillsSeries.js';
import { BEAM_ROI, DARK_ROI, tempFolder, writeJpeg } from './stillsFixtures.js';

const t = tempFolder();
afterAll(() => t.cleanup());

describe('stillsRegionOverlay', () => {
  it('shows the used photo with the most light', () => {
    expect(overlayPhotoIndex(Float64Array.from([0.1, 0.9, 0.5, NaN]), [true, false, true, true])).toBe(2);
    expect(overlayPhotoIndex(Float64Array.from([NaN, 0.2]), [false, false])).toBe(1); // none used: first readable
  });

  it('draws the regions on that photo, enlarged to at least 640 px wide with a legend band below', async () => {
    await writeJpeg(join(t.dir, 'a_0V.jpg'), { beam: 0.05 });
    await writeJpeg(join(t.dir, 'b_9kV.jpg'), { beam: 0.6 });
    const series = await readStillsSeries(t.dir, { roi: BEAM_ROI, darkRoi: DARK_ROI });
    const png = await stillsRegionOverlay(t.dir, series, [true, true]);
    const meta = await sharp(png).metadata();
    expect(meta.format).toBe('png');
    expect(meta.width).toBe(640); // 160 px photo × 4 (renderRegionOverlay enlarges by a whole factor)
    expect(meta.height).toBeGreaterThan(480);
    // the beam disc of the bright photo (b_9kV) is what is shown: its centre (80, 60) × 4 is light
    const { data, info } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
    const centre = data[(240 * info.width + 320) * info.channels]!;
    expect(centre).toBeGreaterThan(150);
  });

  it('without a dark region the surround rings are drawn as an annulus (inner edge of ring A to outer edge of ring B); a found beam is labelled so', async () => {
    const series = await readStillsSeries(t.dir, { roi: BEAM_ROI });
    const regions = stillsOverlayRegions(series);
    expect(regions.map((r) => r.kind)).toEqual(['beam', 'surround']);
    expect(regions[1]).toMatchObject({ rect: series.surround!.b1, innerRect: series.surround!.a0 });
    expect(stillsOverlayRegions({ ...series, beamAuto: true })[0]!.label).toBe('beam (found)');
    const withDark = await readStillsSeries(t.dir, { roi: BEAM_ROI, darkRoi: DARK_ROI });
    expect(stillsOverlayRegions(withDark).map((r) => r.kind)).toEqual(['beam', 'dark']);
  });
});
