import Link from 'next/link';
import { notFound } from 'next/navigation';
import { AnalysisRunner } from '@/components/capture/analysis-runner';
import { DeleteCaptureSetForm, EditCaptureSetForm } from '@/components/capture/capture-set-form';
import { OpticsDetails } from '@/components/capture/optics-details';
import { ProtocolChecklist } from '@/components/capture/protocol-checklist';
import { QueryProvider } from '@/components/capture/query-provider';
import { ReadingsPanel } from '@/components/capture/readings-panel';
import { RegionEditor } from '@/components/capture/region-editor';
import { RegionDraftProvider } from '@/components/capture/region-editor-draft';
import { UploadPanel } from '@/components/capture/upload-panel';
import { EmptyState, PageTitle, Panel } from '@/components/ui/panel';
import { listAnalyses } from '@/db/queries/analyses';
import { getCaptureSet, listRevisionVariants } from '@/db/queries/capture-sets';
import { getPhotosChangedAt, madeBeforePhotoChange } from '@/db/queries/photo-changes';
import { listPhotos } from '@/db/queries/photos';
import { getLatestReading, getReadingForAnalysis } from '@/db/queries/readings';
import { compareVersions } from '@/db/queries/reanalyses';
import { listRegions } from '@/db/queries/regions';
import { ENGINE_VERSION } from '@/lib/photometry/version';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { uuidSchema } from '@/lib/schemas/common';
import { PATTERN_NAMES } from '@/lib/schemas/capture-set';

export default async function CapturePage({ params, searchParams }: { params: Promise<{ captureId: string }>; searchParams: Promise<{ analysis?: string }> }) {
  const { captureId } = await params;
  const { analysis: wanted } = await searchParams;
  const actor = await requireActor();
  if (!uuidSchema.safeParse(captureId).success) notFound();
  const set = await getCaptureSet(actor.labId, captureId);
  if (!set) notFound();
  const [photos, regions, analyses, photosChangedAt] = await Promise.all([listPhotos(actor.labId, set.id), listRegions(actor.labId, set.id), listAnalyses(actor.labId, set.id), getPhotosChangedAt(actor.labId, set.id)]);
  // the edit form offers the revision's variants, as the new-set form does
  const variants = await listRevisionVariants(actor.labId, set.revisionId);
  const selected = wanted && uuidSchema.safeParse(wanted).success ? await getReadingForAnalysis(actor.labId, wanted) : null;
  const latest = await getLatestReading(actor.labId, set.id);
  const reading = selected ?? latest;
  // the newest reading was made from photos that have since been added, removed, replaced or read differently
  const latestAnalysis = latest ? analyses.find((a) => a.id === latest.analysisId) : undefined;
  const photosChanged = !!latestAnalysis && madeBeforePhotoChange(photosChangedAt, latestAnalysis);
  const on = photos.find((p) => p.role === 'on');
  const hasOff = photos.some((p) => p.role === 'off');
  // the ghost the shown reading detected, drawn on the on photo when that reading was made from a photo of its size
  const g = reading?.result.ghost;
  const detectedGhost =
    reading && g && g.source === 'detected' && on && reading.result.image.width === on.width && reading.result.image.height === on.height
      ? { screen: { x: reading.result.screen.x, y: reading.result.screen.y, w: reading.result.screen.w, h: reading.result.screen.h }, dx: g.dx, dy: g.dy, ratio: g.ratio, snr: g.snr ?? null }
      : null;
  const canWrite = can(actor.role, 'capture.write');
  const canDelete = can(actor.role, 'capture.delete');
  const c = set.conditions;
  const conditions = [
    c.ambientLux !== undefined ? `${c.ambientLux} lx ambient` : null,
    c.backgroundCdm2 !== undefined ? `${c.backgroundCdm2} cd/m² background` : null,
    c.displayLevel ? `display ${c.displayLevel}` : null,
    PATTERN_NAMES[set.pattern].phrase,
    set.tiffEncoding === 'linear' ? '16-bit TIFFs read as linear' : set.tiffEncoding === 'srgb' ? '16-bit TIFFs read as sRGB' : null,
  ].filter(Boolean);

  return (
    <QueryProvider>
      <RegionDraftProvider>
      <PageTitle
        kicker={
          <Link href={`/projects/${set.projectId}/revisions/${set.revisionId}`} className="hover:text-beam">
            {set.projectName} · {set.revisionLabel} · capture set
          </Link>
        }
        title={<span data-testid="capture-label">{set.label}</span>}
      >
        {can(actor.role, 'export.create') ? (
          <a href={`/api/captures/${set.id}/report.pdf`} className="rounded-md border border-line bg-raised px-3 py-1.5 text-sm text-ink hover:border-beam/60">
            PDF report
          </a>
        ) : null}
      </PageTitle>
      <p className="-mt-4 mb-6 text-sm text-muted">
        {set.variant ? <span className="mr-2 rounded bg-raised px-1.5 py-0.5 text-ink">{set.variant}</span> : null}
        {conditions.join(' · ')}
        {set.notes ? ` · ${set.notes}` : ''}
      </p>
      <div className="space-y-6">
        <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_22rem]">
          <Panel title="Photos">
            <UploadPanel
              captureSetId={set.id}
              canWrite={canWrite}
              tiffEncoding={set.tiffEncoding}
              photos={photos.map((p) => ({
                id: p.id,
                role: p.role,
                originalName: p.originalName,
                width: p.width,
                height: p.height,
                bytes: p.bytes,
                format: p.format,
                bitDepth: p.bitDepth,
                encodingFile: p.encodingFile,
                encodingReason: p.encodingReason,
                encodingDeclared: p.encodingDeclared,
                pages: p.pages,
                exif: p.exif,
              }))}
            />
          </Panel>
          <Panel title="Capture protocol">
            <ProtocolChecklist />
          </Panel>
        </div>
        <Panel title="Regions">
          {on ? (
            <RegionEditor key={on.id} captureSetId={set.id} photo={{ id: on.id, width: on.width, height: on.height }} initial={regions} canWrite={canWrite} detectedGhost={detectedGhost} />
          ) : (
            <EmptyState title="No on photo yet">The regions are drawn on the display-on photo, in its full-resolution pixels.</EmptyState>
          )}
        </Panel>
        <Panel title="Reading">
          <div className="space-y-5">
            <AnalysisRunner
              captureSetId={set.id}
              current={analyses[0]?.id ?? null}
              canRun={can(actor.role, 'analysis.run')}
              ready={!!on && hasOff}
              readyHint="Upload the on and off photos first."
              // the set's newest reading decides: an earlier one picked from the history is just history
              outdated={latest && compareVersions(latest.engineVersion, ENGINE_VERSION) < 0 ? { readingEngine: latest.engineVersion, currentEngine: ENGINE_VERSION } : null}
              photosChanged={photosChanged}
            />
            <ReadingsPanel reading={reading} analyses={analyses} captureSetId={set.id} selectedId={reading?.analysisId ?? null} />
            {reading ? <OpticsDetails result={reading.result} /> : null}
          </div>
        </Panel>
        {canWrite || canDelete ? (
          <Panel title="Capture set details">
            <div className="space-y-5">
              {canWrite ? (
                <details>
                  <summary className="cursor-pointer text-sm text-beam">Edit label, variant, pattern and conditions</summary>
                  <div className="mt-3">
                    <EditCaptureSetForm
                      id={set.id}
                      values={{ label: set.label, variant: set.variant, pattern: set.pattern, tiffEncoding: set.tiffEncoding, ambientLux: c.ambientLux, backgroundCdm2: c.backgroundCdm2, displayLevel: c.displayLevel, notes: set.notes }}
                      variants={variants}
                    />
                  </div>
                </details>
              ) : null}
              {canDelete ? <DeleteCaptureSetForm id={set.id} label={set.label} /> : null}
            </div>
          </Panel>
        ) : null}
      </div>
      </RegionDraftProvider>
    </QueryProvider>
  );
}
