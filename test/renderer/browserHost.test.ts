// @vitest-environment happy-dom
/** The browser host: chunked reading, hashing, the recent list, downloads. */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { baseName, createBrowserHost, filesNamedBy } from '../../renderer/src/host/browserHost.ts';
import { sample } from './support.ts';

afterEach(() => {
  vi.restoreAllMocks();
  localStorage.clear();
});

describe('browser host', () => {
  it('reads a file in chunks without breaking a character split between them', async () => {
    const host = createBrowserHost(window);
    const text = 'α [deg],ΔCL\n1.5,0.25\n°C ✓\n';
    const [chosen] = await host.acceptDroppedFiles!([new File([text], 'greek.csv')]);
    const parts: string[] = [];
    // 3-byte chunks: α and Δ are two bytes in UTF-8, ✓ three, so most characters straddle a boundary
    await host.readChunks(chosen!.id, (t) => parts.push(t), 3);
    expect(parts.join('')).toBe(text);
    expect(parts.length).toBeGreaterThan(5);
    expect(chosen!.size).toBe(new TextEncoder().encode(text).length);
  });

  it('waits for the reader before sending the next chunk', async () => {
    const host = createBrowserHost(window);
    const [chosen] = await host.acceptDroppedFiles!([new File(['x'.repeat(100)], 'x.csv')]);
    let busy = false;
    let overlapped = false;
    await host.readChunks(
      chosen!.id,
      (async () => {
        if (busy) overlapped = true;
        busy = true;
        await new Promise((r) => setTimeout(r, 2));
        busy = false;
      }) as unknown as (t: string) => void,
      10,
    );
    expect(overlapped).toBe(false);
  });

  it('hashes with SHA-256 (FIPS 180-2 appendix B.1: "abc")', async () => {
    const host = createBrowserHost(window);
    const [chosen] = await host.acceptDroppedFiles!([new File(['abc'], 'abc.txt')]);
    expect(await host.sha256(chosen!.id)).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('refuses an id it never handed out', async () => {
    const host = createBrowserHost(window);
    await expect(host.readChunks('nope', () => undefined)).rejects.toThrow(/no file with id "nope"/);
  });

  it('lists the files a campaign names, runs and tares, once each', () => {
    expect(filesNamedBy(sample('sweepbook-campaign.json'))).toEqual([
      'run-101-clean.csv',
      'windoff-tare.csv',
      'run-102-flap10.csv',
      'run-103-flap20.csv',
      'run-104-clean-timehistory.csv',
      'run-201-section.csv',
    ]);
    expect(filesNamedBy('not json')).toEqual([]);
    expect(baseName('runs/day 2\\run-7.csv')).toBe('run-7.csv');
  });

  it('downloads a saved campaign, remembers it, and reopens it from the recent list with its runs to be chosen again', async () => {
    const host = createBrowserHost(window);
    const clicks: string[] = [];
    vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
      clicks.push(this.download);
    });
    const text = sample('sweepbook-campaign.json');
    const saved = await host.saveCampaign(text, { saveAs: true, suggestedName: 'flap study.json' });
    expect(saved?.name).toBe('flap study.json');
    expect(clicks).toEqual(['flap study.json']);
    expect(await host.recentCampaigns()).toEqual([{ id: 'flap study.json', name: 'flap study.json' }]);
    const reopened = await host.openRecentCampaign!('flap study.json');
    expect(reopened?.text).toBe(text);
    expect(reopened?.runs.every((r) => r.id === null)).toBe(true);
    expect(reopened?.runs.length).toBe(6);
  });

  it('offers exports as downloads with their names', async () => {
    const host = createBrowserHost(window);
    const names: string[] = [];
    vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
      names.push(this.download);
    });
    expect(await host.saveExport('101-points.csv', 'a,b\n', 'text/csv')).toBe(true);
    expect(await host.saveExport('plot.png', new Uint8Array([137, 80, 78, 71]), 'image/png')).toBe(true);
    expect(names).toEqual(['101-points.csv', 'plot.png']);
  });
});
