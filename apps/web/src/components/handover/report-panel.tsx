// The printable report: everyone opens the HTML version; leads also download the PDF, which the
// server builds on request (a spinner until the first bytes arrive, then the download's progress).
import { Button, Spinner } from '../ui.tsx';
import { TransferProgress } from './transfer-progress.tsx';
import { useDownload } from './use-download.ts';

export function ReportPanel({ campaignId, canLead }: { campaignId: string; canLead: boolean }) {
  const pdf = useDownload();
  return (
    <div className="space-y-3">
      <p className="text-sm text-[var(--muted)]">Set-up, kit and calibration status, settings, quality summary, FRFs with their dB reference, the mode table and the MAC matrix, with an appendix of hashes.</p>
      <div className="flex flex-wrap gap-2">
        <a
          href={`/api/campaigns/${campaignId}/report.html`}
          target="_blank"
          rel="noopener"
          className="inline-flex min-h-10 items-center justify-center gap-2 rounded-md bg-accent px-4 text-sm font-medium text-white hover:bg-accent-strong focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent"
        >
          <span aria-hidden>↗</span>
          Open report
          <span className="sr-only">(opens in a new tab)</span>
        </a>
        {canLead && (
          <Button type="button" variant="secondary" disabled={pdf.busy} onClick={() => void pdf.start(`/campaigns/${campaignId}/report.pdf`, 'report.pdf')}>
            <span aria-hidden>⤓</span>
            Download PDF
          </Button>
        )}
      </div>
      {pdf.progress && (pdf.progress.loaded === 0 ? <Spinner label="Building the PDF… this can take a few seconds." /> : <TransferProgress progress={pdf.progress} label="Downloading the PDF" />)}
    </div>
  );
}
