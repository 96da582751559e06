// The averaged FRF of one entry: H1 of each response channel (magnitude and phase, or another
// view), coherence underneath, with the number of averages. Channel colours as on every plot.
import { useMemo } from 'react';
import { Plot } from '../plot.tsx';
import { frfFigure, type FrfView } from '../../lib/frf-figure.ts';
import type { FrfKind } from '../../lib/frf-math.ts';
import type { FrfAnswer } from '../../lib/hits-data.ts';
import { plotColours, plotConfig, responseColour } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';

export interface FrfDisplay {
  view: FrfView;
  kind: FrfKind;
  db: boolean;
  logF: boolean;
  /** Unwrapped phase (continuous through ±180°) instead of wrapped. */
  unwrap?: boolean;
}

/** `untitled`: the figure without its own title line, for a panel whose header says the same (Tap). */
/** "Accelerance H1 from 5 averages · |H| in dB re 1 (m/s²)/N": what the FRF figure shows. */
export function frfPlotTitle(frf: FrfAnswer, display: FrfDisplay): string {
  const scaling = display.view === 'magphase' ? (display.db ? `|H| in dB re 1 ${frf.unit}` : `|H| in ${frf.unit}`) : `H in ${frf.unit}`;
  return `${display.kind[0]!.toUpperCase()}${display.kind.slice(1)} H1 from ${frf.averages} average${frf.averages === 1 ? '' : 's'} · ${scaling}`;
}

export function FrfPlot({ frf, display, height = 460, showH2 = false, uirevision, untitled = false }: { frf: FrfAnswer; display: FrfDisplay; height?: number; showH2?: boolean; uirevision?: string; untitled?: boolean }) {
  const theme = useThemeName();
  const fig = useMemo(() => {
    const c = plotColours(theme === 'dark');
    const curves = frf.channels.flatMap((ch, i) => {
      const colour = responseColour(i, c.dark);
      const h1 = { name: `H1 ${ch.responseDof} / ${frf.excitationDof}`, f: frf.f, h: ch.h1, coherence: ch.coherence, colour };
      return showH2 ? [h1, { name: `H2 ${ch.responseDof} / ${frf.excitationDof}`, f: frf.f, h: ch.h2, colour, dash: 'dot' as const }] : [h1];
    });
    return frfFigure(curves, {
      ...display,
      colours: c,
      coherence: true,
      title: untitled ? undefined : frfPlotTitle(frf, display),
      uirevision,
      // Below about 320 px the three rows' full titles run into each other (Tap at 1024×768).
      compact: height < 320,
    });
  }, [frf, display, theme, showH2, uirevision, untitled, height]);
  return <Plot label={`Averaged FRF and coherence from ${frf.averages} hits`} data={fig.data} layout={fig.layout} config={plotConfig} height={height} />;
}
