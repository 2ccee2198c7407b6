// @vitest-environment happy-dom
/**
 * The campaign state: opening with missing and changed files, unsaved-change tracking, importing with a
 * column mapping remembered per header, setup edits reducing again, saving, and the menu commands.
 */
import { describe, expect, it } from 'vitest';
import { parseCampaign } from '../../core/formats/campaign.ts';
import { nextTick } from 'vue';
import { appContext, fakeHost, openedSample, sample } from './support.ts';

describe('workbench', () => {
  it('opens a campaign, names a missing and a changed file, and keeps both in the campaign', async () => {
    const ctx = appContext();
    const opened = await openedSample(ctx.host, ['run-103-flap20.csv']);
    opened.runs.find((r) => r.file === 'run-102-flap10.csv')!.sha256 = 'f'.repeat(64);
    ctx.host.nextCampaign = opened;
    await ctx.wb.openCampaign();
    const e = ctx.wb.state.entries;
    expect(e['run-101-clean.csv']!.status).toBe('ready');
    expect(e['run-103-flap20.csv']!.status).toBe('missing');
    expect(e['run-102-flap10.csv']!.status).toBe('ready');
    expect(e['run-102-flap10.csv']!.hashNote).toMatch(/^run-102-flap10\.csv: the file has changed since the campaign was saved/);
    const banners = ctx.wb.state.banners.map((b) => b.text).join('\n');
    expect(banners).toContain('Not found beside the campaign: run-103-flap20.csv');
    expect(banners).toContain('run-102-flap10.csv: the file has changed');
    expect(ctx.wb.dirty.value).toBe(false);

    expect(await ctx.wb.save(false)).toBe(true);
    const saved = parseCampaign('saved.json', ctx.host.saved[0]!.text);
    expect(saved.runs.map((r) => r.file)).toEqual(parseCampaign('c', sample('sweepbook-campaign.json')).runs.map((r) => r.file));
    // the recorded hash stays until the user accepts the changed file
    expect(saved.runs[1]!.sha256).toBe(parseCampaign('c', sample('sweepbook-campaign.json')).runs[1]!.sha256);
    ctx.wb.acceptChangedFile('run-102-flap10.csv');
    expect(ctx.wb.state.campaign.runs[1]!.sha256).toBe('f'.repeat(64));
    expect(ctx.wb.dirty.value).toBe(true);
  });

  it('explains a campaign it cannot read and changes nothing', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = { id: 'x', name: 'broken.json', text: '{"format":"sweepbook-campaign","version":1,"name":"x","setups":{},"runs":[{"file":"a.csv"}]}', runs: [], backupAvailable: true };
    await ctx.wb.openCampaign();
    expect(ctx.wb.state.banners[0]!.kind).toBe('error');
    expect(ctx.wb.state.banners[0]!.text).toMatch(/^broken\.json: runs\.0\.sha256: .*A backup of the campaign exists beside it\. Nothing was changed\.$/);
    expect(ctx.wb.state.campaign.runs).toEqual([]);
  });

  it('offers the backup of a campaign it cannot read, where the host can open it, and opens it unsaved', async () => {
    const questions: string[] = [];
    const ctx = appContext(fakeHost(), async (q) => {
      questions.push(q);
      return true;
    });
    const good = await openedSample(ctx.host);
    const asked: string[] = [];
    ctx.host.openCampaignBackup = async (id) => {
      asked.push(id);
      return { ...good, id: 'c9', name: 'broken.json', backupAvailable: true };
    };
    ctx.host.nextCampaign = { id: 'c9', name: 'broken.json', text: '{"format":"sweepbook-campaign"', runs: [], backupAvailable: true };
    await ctx.wb.openCampaign();
    expect(questions.length).toBe(1);
    expect(questions[0]).toMatch(/^broken\.json:1:31: not valid JSON .*\n\nThe previous version of the campaign is kept beside it as a backup\. Open the backup instead\?/s);
    expect(asked).toEqual(['c9']);
    expect(ctx.wb.state.campaign.runs.length).toBe(5);
    expect(ctx.wb.state.entries['run-101-clean.csv']!.status).toBe('ready');
    // saving goes to the campaign file (the backup came with its id), and is still to be done
    expect(ctx.wb.state.campaignId).toBe('c9');
    expect(ctx.wb.dirty.value).toBe(true);
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(/^broken\.json could not be read \(.*\); its backup was opened instead\. Save to make it the campaign again\.$/);

    // declined: nothing changes, and the message still says a backup exists
    const declined = appContext(fakeHost(), async () => false);
    declined.host.openCampaignBackup = async () => {
      throw new Error('not to be called');
    };
    declined.host.nextCampaign = { id: 'c9', name: 'broken.json', text: '{', runs: [], backupAvailable: true };
    await declined.wb.openCampaign();
    expect(declined.wb.state.banners[0]!.text).toMatch(/A backup of the campaign exists beside it\. Nothing was changed\.$/);
    expect(declined.wb.state.campaign.runs).toEqual([]);
  });

  it('tracks unsaved changes and tells the host', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host);
    await ctx.wb.openCampaign();
    await nextTick();
    expect(ctx.host.dirtyCalls[ctx.host.dirtyCalls.length - 1]).toBe(false);
    ctx.wb.setVisible('run-104-clean-timehistory.csv', false);
    await nextTick();
    expect(ctx.wb.dirty.value).toBe(true);
    expect(ctx.host.dirtyCalls[ctx.host.dirtyCalls.length - 1]).toBe(true);
    // the sample has no file of its own: the first save is a save-as
    await ctx.wb.save(false);
    expect(ctx.host.saved[0]!.options).toMatchObject({ id: 'c1', saveAs: false });
    await nextTick();
    expect(ctx.host.dirtyCalls[ctx.host.dirtyCalls.length - 1]).toBe(false);
  });

  it('asks before discarding unsaved changes', async () => {
    const questions: string[] = [];
    const ctx = appContext(fakeHost(), async (q) => {
      questions.push(q);
      return false;
    });
    ctx.wb.state.campaign.name = 'edited';
    await ctx.wb.newCampaign();
    expect(questions).toEqual(['The campaign has unsaved changes. Discard them?']);
    expect(ctx.wb.state.campaign.name).toBe('edited');
  });

  it('imports a file with an unknown header through the mapping step and remembers it for the next such file', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host);
    await ctx.wb.openCampaign();
    const renamed = (run: string, text: string) => text.replace(/# run: \d+/, `# run: ${run}`).replace('alpha [deg],dp_pitot [Pa]', 'AoA [deg],Pitot [Pa]');
    ctx.host.add('run-301.csv', renamed('301', sample('run-101-clean.csv')));
    ctx.host.add('run-302.csv', renamed('302', sample('run-103-flap20.csv')));
    ctx.host.nextChoice = ['run-301.csv'];
    await ctx.wb.importRuns();
    const e = ctx.wb.state.entries['run-301.csv']!;
    expect(e.status).toBe('needs-mapping');
    expect(e.errors[0]).toMatch(/^run-301\.csv:7: missing required column "alpha"/);
    expect(e.header?.cells[0]).toEqual({ name: 'AoA', unit: 'deg', unitFrom: 'brackets' });

    await ctx.wb.applyMapping('run-301.csv', { names: { aoa: 'alpha', pitot: 'dp_pitot' }, units: {} });
    expect(ctx.wb.state.entries['run-301.csv']!.status).toBe('ready');
    expect(ctx.wb.state.campaign.mappings?.[e.header!.signature]).toEqual({ names: { aoa: 'alpha', pitot: 'dp_pitot' }, units: {} });
    expect(ctx.wb.state.campaign.runs.at(-1)).toMatchObject({ file: 'run-301.csv', configuration: 'clean', setup: 'KM-7 wing', visible: true });
    expect(ctx.wb.state.campaign.runs.at(-1)!.sha256).toMatch(/^[0-9a-f]{64}$/);

    ctx.host.nextChoice = ['run-302.csv'];
    await ctx.wb.importRuns();
    expect(ctx.wb.state.entries['run-302.csv']!.status).toBe('ready');
    // same numbers as the sample run it was made from (same setup, no tare on an imported run)
    const r302 = ctx.wb.state.entries['run-302.csv']!.result!;
    expect(r302.points.length).toBe(15);
    // neither is taken as settled: both wait for the user's choice of setup and tare
    expect(ctx.wb.state.unconfirmed).toEqual(['run-301.csv', 'run-302.csv']);
    ctx.wb.confirmImport('run-301.csv', 'KM-7 wing', 'windoff-tare.csv');
    await ctx.wb.settled();
    expect(ctx.wb.state.unconfirmed).toEqual(['run-302.csv']);
    expect(ctx.wb.runOf('run-301.csv')).toMatchObject({ setup: 'KM-7 wing', tare: 'windoff-tare.csv' });
    expect(ctx.wb.state.entries['run-301.csv']!.result!.run.tare_file).toBe('windoff-tare.csv');
  });

  it('does not add a file twice, and locates a missing run by importing its file', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host, ['run-103-flap20.csv']);
    await ctx.wb.openCampaign();
    ctx.host.add('run-101-clean.csv', sample('run-101-clean.csv'));
    ctx.host.add('run-103-flap20.csv', sample('run-103-flap20.csv'));
    ctx.host.nextChoice = ['run-101-clean.csv', 'run-103-flap20.csv'];
    await ctx.wb.importRuns();
    expect(ctx.wb.state.campaign.runs.length).toBe(5);
    expect(ctx.wb.state.banners.map((b) => b.text)).toContain('run-101-clean.csv is already in the campaign (as run-101-clean.csv); not added again.');
    expect(ctx.wb.state.entries['run-103-flap20.csv']!.status).toBe('ready');
    expect(ctx.wb.state.entries['run-103-flap20.csv']!.hashNote).toBeNull();
  });

  it('reduces the runs of a setup again when it is applied', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host);
    await ctx.wb.openCampaign();
    const before = ctx.wb.state.entries['run-101-clean.csv']!.result!.points[5]!.cl!;
    const setup = JSON.parse(JSON.stringify(ctx.wb.state.campaign.setups['KM-7 wing'])) as { model: { area_m2: number } };
    setup.model.area_m2 *= 2;
    await ctx.wb.applySetup('KM-7 wing', setup);
    const after = ctx.wb.state.entries['run-101-clean.csv']!.result!.points[5]!.cl!;
    // CL = L/(qS): twice the area, very nearly half the coefficient (the corrections move a little with S)
    expect(after / before).toBeCloseTo(0.5, 2);
    expect(ctx.wb.state.entries['run-201-section.csv']!.result!.points[5]!.cl).not.toBeCloseTo(after, 3);
  });

  it('keeps imported runs waiting for a setup in a new campaign and refuses to save one that names none', async () => {
    const ctx = appContext();
    ctx.host.add('run-101-clean.csv', sample('run-101-clean.csv'));
    ctx.host.nextChoice = ['run-101-clean.csv'];
    await ctx.wb.importRuns();
    expect(ctx.wb.state.entries['run-101-clean.csv']!.status).toBe('needs-setup');
    expect(ctx.wb.state.editingSetup).toBe('setup 1');
    expect(await ctx.wb.save(true)).toBe(false);
    expect(ctx.wb.state.banners.at(-1)!.text).toBe('Not saved: run-101-clean.csv names setup "setup 1", which has not been applied yet.');
    await ctx.wb.applySetup('setup 1', JSON.parse(sample('setup-3d.json')));
    expect(ctx.wb.state.entries['run-101-clean.csv']!.status).toBe('ready');
    expect(await ctx.wb.save(true)).toBe(true);
  });

  it('takes dropped files through either host\'s way of adopting them', async () => {
    const browser = appContext();
    await browser.wb.dropFiles([new File([sample('run-101-clean.csv')], 'run-101-clean.csv')]);
    expect(browser.wb.state.campaign.runs.map((r) => r.file)).toEqual(['run-101-clean.csv']);

    // the Electron preload adopts one file at a time
    const host = fakeHost();
    const adopt = host.acceptDroppedFiles!;
    delete host.acceptDroppedFiles;
    const adopted: string[] = [];
    host.adoptDroppedFile = async (f) => {
      adopted.push(f.name);
      return (await adopt([f]))[0]!;
    };
    const electron = appContext(host);
    await electron.wb.dropFiles([new File(['a'], 'a.csv'), new File(['b'], 'b.csv')]);
    expect(adopted).toEqual(['a.csv', 'b.csv']);
    expect(electron.wb.state.campaign.runs.map((r) => r.file)).toEqual(['a.csv', 'b.csv']);
  });

  it('runs the native menu\'s commands', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host);
    const exported: string[] = [];
    ctx.wb.handleMenu('campaign:open', {});
    await ctx.wb.settled();
    await new Promise((r) => setTimeout(r, 0));
    await ctx.wb.settled();
    expect(ctx.wb.state.campaign.runs.length).toBe(5);
    ctx.wb.handleMenu('export:points-csv', { 'export:points-csv': () => exported.push('points') });
    expect(exported).toEqual(['points']);
  });

  it('builds the provenance of a run as core does, with the setup hashed from the campaign', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host);
    await ctx.wb.openCampaign();
    const p = await ctx.wb.provenance(['run-101-clean.csv']);
    const rec = p.runs[0]!.record;
    expect(rec.inputs.map((i) => i.role)).toEqual(['setup', 'run', 'tare']);
    expect(rec.inputs[1]!.sha256).toBe(parseCampaign('c', sample('sweepbook-campaign.json')).runs[0]!.sha256);
    expect(rec.inputs[0]!.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(rec.corrections).toEqual({ enabled: true, kind: '3d', wake: 'classic', method: '3d-classic', fallback: null });
    expect(rec.reduced_at).toBe(ctx.wb.state.entries['run-101-clean.csv']!.reducedAt);
  });
});
