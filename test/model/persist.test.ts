import { describe, expect, it } from 'vitest';
import { autosaveEntry, designFromFragment, fileName, restoreAutosave, shareFragment } from '../../src/model/persist.js';
import { demoDesign } from '../../src/model/demos.js';

describe('share link', () => {
  it('round-trips a design through the URL fragment, Unicode included', () => {
    const d = { ...demoDesign('bench-clamp'), title: 'Zange – 100 mV/A µ Ω' };
    const back = designFromFragment(shareFragment(d));
    expect(back?.ok).toBe(true);
    if (back?.ok) expect(back.design).toEqual(d);
  });
  it('says what is wrong with a damaged link, and nothing for a fragment without a design', () => {
    expect(designFromFragment('#about')).toBeNull();
    const bad = designFromFragment('#d=%%%');
    expect(bad?.ok).toBe(false);
    const wrong = designFromFragment(`#d=${Buffer.from('{"format":"x"}').toString('base64url')}`);
    expect(wrong?.ok === false && wrong.problems[0]!.path).toBe('format');
  });
});

describe('autosave', () => {
  it('restores what it saved', () => {
    const d = demoDesign('appliance-ct');
    const r = restoreAutosave(autosaveEntry(d));
    expect(r.kind).toBe('ok');
    if (r.kind === 'ok') expect(r.design).toEqual(d);
  });
  it('reports a damaged entry with its text, so nothing is lost', () => {
    expect(restoreAutosave(null).kind).toBe('none');
    const a = restoreAutosave('{"v":1,"design":');
    expect(a.kind === 'damaged' && a.text).toBe('{"v":1,"design":');
    expect(restoreAutosave('{"v":9,"design":{}}').kind).toBe('damaged');
    expect(restoreAutosave('{"v":1,"design":{"format":"gainwright-design","version":1}}').kind).toBe('damaged');
  });
  it('makes a safe file name from the title', () => {
    expect(fileName({ ...demoDesign(), title: '../../etc/passwd <b>' }, 'json')).toBe('etc-passwd-b.json');
    expect(fileName({ ...demoDesign(), title: '***' }, 'csv')).toBe('design.csv');
  });
});
