// The hand-over bundle's README: what every file and column is and where each number comes from.
import type { HandoverData } from './handover-data.ts';
import { DB_REFERENCE } from './report-words.ts';

/** The bundle's name and layout version, in the README and the JSON document. */
export const BUNDLE_FORMAT = 'resonote-handover-bundle';
export const BUNDLE_VERSION = 1;

export function readme(d: HandoverData, raw: boolean): string {
  const c = d.campaign;
  return `Resonote hand-over bundle (${BUNDLE_FORMAT}, version ${BUNDLE_VERSION})
=====================================================

Campaign:   ${c.name}
Structure:  ${c.structure || '-'}
Client:     ${c.client || '-'}
Campaign id ${c.id}
Exported:   ${d.generatedAt.toISOString()}
Settings:   version ${d.settings.version} (of ${d.settings.history.length} saved versions; see settings.json)

Conventions
-----------
- FRF H_ij = response at DOF i / force at DOF j, written H(response, excitation).
- DOF label: <point label>:<signed axis>, e.g. B05:+Z, in a right-handed global frame.
  In file names the colon is dropped: frf/B21+Z_B05+Z.csv is H(B21:+Z, B05:+Z).
- Time dependence e^{+jwt}; spectra X(f) = dt * sum x_n e^{-j 2 pi k n / N}.
- The hammer force is positive in compression (along the strike direction). A sensor mounted
  against its DOF direction is recorded with sign -1, corrected before averaging.
- Units: coordinates mm; frequency Hz; force N; acceleration m/s^2; FRFs are accelerance in
  (m/s^2)/N; damping in % of critical; sensitivities mV/N (hammer), mV/(m/s^2) (accelerometers).
- Magnitudes in the report are ${DB_REFERENCE} (20*log10 |H|). The files hold complex values, not dB.
- Estimators over the accepted hits of an entry (one triggered record = one average, no overlap):
  G_ff = mean |F|^2, G_xx = mean |X|^2, G_fx = mean conj(F)*X  (windows applied first)
  H1 = G_fx / G_ff,  H2 = G_xx / G_xf (G_xf = conj(G_fx)),  coherence = |G_fx|^2 / (G_ff G_xx), 0..1.
- Numbers are written with full double precision (shortest text that reads back exactly).

Files
-----
README.txt        this file
campaign.json     campaign summary: name, structure, client, purpose, test type, reference DOFs, notes
geometry.csv      label,x_mm,y_mm,z_mm,directions   (directions space-separated, e.g. "+Z -X")
lines.csv         point_a,point_b   (labels of the two points each line joins)
schedule.csv      position,response_dof,excitation_dof,driving_point,status,required_hits,
                  accepted_hits,rejected_hits,assignee,note,entry_id,frf_files
frf/index.csv     file,response_dof,excitation_dof,entry_id,averages,settings_version,input_hash,
                  mean_coherence_in_band,hit_ids   (hit_ids space-separated)
frf/<response>_<excitation>.csv
                  frequency_hz,h1_re,h1_im,h2_re,h2_im,coherence
                  every spectral line from 0 Hz to half the sample rate (df = sample rate / samples);
                  H1, H2 accelerance in (m/s^2)/N; coherence dimensionless 0..1.
modes.csv         the campaign's mode table, one row per mode (from one or several fits):
                  mode,f_hz,zeta_percent,mpc,f_hz_before_window_correction,
                  zeta_percent_before_window_correction,fit_id,band_low_hz,band_high_hz,
                  references,model_order,pole_index,fit_input_hash,mass_normalised,found_twice_as_mode
                  (f and zeta are corrected for the exponential window: sigma_true = sigma_est - 1/tau;
                  found_twice_as_mode: the mode number that already holds this mode, frequencies
                  within 1 % and MAC >= 0.9 over the shared DOFs, common practice)
mode-shapes.csv   long format, one row per mode and DOF: mode,dof,re,im,real
                  re/im: unit-normalised complex shape (largest entry 1); real: its best real fit.
mode-shapes-mass-normalised.csv
                  mode,dof,re,im,real in 1/sqrt(kg) (unit modal mass, from the driving-point residue,
                  Ewins 2000; real: rotated so the driving point is real and positive); only modes
                  whose fit had a driving point; none for the others (modes.csv mass_normalised=no).
                  Directions: every DOF is on the positive axis of its point (+X, +Y, +Z); a DOF
                  measured as -Z had its values multiplied by -1 (H(i,-d) = -H(i,+d)).
mac.csv           the MAC matrix of the table's shapes over the DOFs each pair shares
correlation.csv   test modes paired with the newest FE model version by MAC (Allemang & Brown 1982),
                  highest MAC first: test_mode,test_hz,model_mode,model_hz,frequency_difference_percent,mac
                  (difference = (f_test - f_model)/f_model x 100); only when the campaign holds a model
correlation.json  the same with the model version, the DOFs compared, the full MAC matrix (test rows,
                  model columns), unpaired modes and cross-orthogonality (SEREP-reduced mass,
                  O'Callahan, Avitabile & Riemer 1989) where both sides are mass-normalised
settings.json     { currentVersion, current, history: [{ version, settings, reason, createdAt, createdBy }] }
                  field names carry their units (sampleRateHz, recordLengthS, triggerLevelN, ...)
kit.json          hammers and accelerometers with sensitivities (as entered and in base units),
                  latest calibration and its state at test time; the channel map
noise.csv         background-noise checks, one row per check and channel: recorded_at,recorded_by,
                  source,duration_s,channel,role,dof,unit,rms_in_band,peak,status,reading
                  (rms_in_band and peak in the channel's unit, N or m/s^2; Welch PSD, Hann, mean removed)
${
  raw
    ? `hits/index.csv    one row per hit (accepted and rejected): file,hit_id,entry_id,sequence,verdict,reasons,
                  settings_version,sample_rate_hz,samples,recorded_at,recorded_by,sha256,channels
hits/<response>_<excitation>/<sequence>.csv
                  time_s, then one column per channel in storage order (force first):
                  ch<n>_force_N_<dof>, ch<n>_response_ms2_<dof>. t = 0 at the record start; the
                  trigger is at the pre-trigger time. Values are the stored float32 samples in
                  engineering units (volts / sensitivity), before offset removal and windows,
                  written as the shortest decimal that rounds back to the same float32.
                  sha256 in hits/index.csv is over the stored float32 little-endian bytes.
`
    : `(raw time data: export again with ?raw=1 to add hits/)
`
}
Where every number comes from
-----------------------------
- Each FRF file is the average of the accepted hits listed in frf/index.csv (hit_ids), processed
  with settings version settings_version. input_hash = SHA-256 over the settings version and the
  accepted hit ids with their verdict versions: the same hash means the same inputs. Raw hits are
  never changed or deleted in Resonote, so each FRF can be recomputed from them.
- Each mode comes from the modal fit fit_id of its row (modes.csv) with that fit's band, model
  order and input hash; the FRF input hashes each fit used are in the report's appendix B and in
  the JSON bundle (modes.fits).
- The JSON bundle (export/bundle.json) holds exactly the same content as one document.
`;
}
