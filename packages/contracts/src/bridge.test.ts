import { describe, expect, it } from 'vitest';
import { acquisitionSettingsSchema, defaultAcquisitionSettings } from './settings.ts';
import { dofKey, fileNamePatternProblem, matchFileName } from './bridge.ts';

describe('file-name patterns of the watched-folder bridge', () => {
  it('reads both DOF labels out of a name like P07+Z_P01+Z_003.wav', () => {
    expect(matchFileName('{response}_{excitation}_*.wav', 'P07+Z_P01+Z_003.wav')).toEqual({ response: 'P07+Z', excitation: 'P01+Z' });
    expect(matchFileName('{response}_{excitation}_*.wav', 'p07-x_p01+z_take 2.WAV')).toEqual({ response: 'p07-x', excitation: 'p01+z' });
  });

  it('reads one label when the pattern names one, and refuses names that do not fit', () => {
    expect(matchFileName('hit-{excitation}-??.csv', 'hit-B05:+Z-03.csv')).toEqual({ excitation: 'B05:+Z' });
    expect(matchFileName('{response}_{excitation}_*.wav', 'P07+Z.wav')).toBeNull();
    expect(matchFileName('{response}_{excitation}_*.wav', 'P07+Z_P01+Z_003.csv')).toBeNull();
    // a dot in the pattern is a dot, not "any character"
    expect(matchFileName('{response}.wav', 'P07+Zxwav')).toBeNull();
  });

  it('treats P07:+Z and P07+Z as the same DOF', () => {
    expect(dofKey('P07:+Z')).toBe(dofKey('p07+z'));
  });

  it('says why a pattern cannot be used, and the settings refuse it', () => {
    expect(fileNamePatternProblem('*.wav')).toMatch(/neither/);
    expect(fileNamePatternProblem('{response}_{response}.wav')).toMatch(/once/);
    expect(fileNamePatternProblem('{point}_{excitation}.wav')).toMatch(/only \{response\} and \{excitation\}/);
    const bad = acquisitionSettingsSchema.safeParse({ ...defaultAcquisitionSettings, bridgeFilePattern: '*.wav' });
    expect(bad.success).toBe(false);
    const old = acquisitionSettingsSchema.parse({ ...defaultAcquisitionSettings, resampleUploads: undefined, bridgeFilePattern: undefined });
    // Settings saved before these fields existed read as "refuse other rates, no pattern".
    expect([old.resampleUploads, old.bridgeFilePattern]).toEqual([false, '']);
  });
});
