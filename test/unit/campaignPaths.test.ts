import { describe, expect, it } from 'vitest';
import { campaignFiles, campaignPathProblem, emptyCampaign, parseCampaign, serializeCampaign } from '../../core/formats/campaign.ts';
import { CAMPAIGN_MAX_BYTES, CAMPAIGN_MAX_FILES } from '../../core/formats/limits.ts';

describe('campaign paths (relative, inside the campaign folder)', () => {
  it.each(['run.csv', 'runs/run-101.csv', 'a b/c,d.csv', '.hidden.csv'])('accepts %j', (p) => {
    expect(campaignPathProblem(p)).toBeUndefined();
  });

  it.each([
    ['', /empty/],
    ['/etc/passwd', /absolute/],
    ['/dev/zero', /absolute/],
    ['../x.csv', /leaves the campaign folder/],
    ['a/../../x.csv', /leaves the campaign folder/],
    ['..', /leaves/],
    ['\\\\host\\share\\x.csv', /backslash/],
    ['..\\x.csv', /backslash/],
    ['C:/x.csv', /drive-letter/],
    ['c:x.csv', /drive-letter/],
    ['file:///etc/passwd', /URL|absolute/],
    ['a//b.csv', /empty or "\."/],
    ['./a.csv', /empty or "\."/],
    ['a\0.csv', /NUL/],
  ])('refuses %j with its reason', (p, reason) => {
    expect(campaignPathProblem(p)).toMatch(reason);
  });

  it('lists every run and tare file once, in order of first mention', () => {
    const c = {
      ...emptyCampaign(),
      runs: [
        { file: 'b.csv', sha256: null, setup: 's', tare: 't.csv' },
        { file: 'a.csv', sha256: null, setup: 's', tare: 't.csv' },
      ],
      tares: [
        { file: 't.csv', sha256: null },
        { file: 'u.csv', sha256: null },
      ],
    };
    expect(campaignFiles(c)).toEqual(['b.csv', 'a.csv', 't.csv', 'u.csv']);
  });
});

describe('campaign size limits', () => {
  it('refuses a campaign text above the size limit with a message naming the file and the limit', () => {
    const text = serializeCampaign(emptyCampaign()).replace('"Untitled campaign"', JSON.stringify('x'.repeat(CAMPAIGN_MAX_BYTES)));
    expect(() => parseCampaign('huge.json', text)).toThrow(/at most 64\.0 MiB/);
  });

  it('refuses a campaign naming more files than the limit', () => {
    const c = {
      ...emptyCampaign(),
      setups: {},
      runs: [],
      tares: Array.from({ length: CAMPAIGN_MAX_FILES + 1 }, (_, i) => ({ file: `t${i}.csv`, sha256: null })),
    };
    expect(() => parseCampaign('many.json', JSON.stringify(c))).toThrow(/at most 100000/);
  });
});
