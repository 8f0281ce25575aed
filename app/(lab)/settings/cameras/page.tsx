import { forbidden } from 'next/navigation';
import { CalibrationForm, DegreesPerPixelForm, DeleteProfileButton, LinearityForm } from '@/components/cameras/camera-forms';
import { EmptyState, Notice, Panel } from '@/components/ui/panel';
import { listCameraProfiles } from '@/db/queries/camera-profiles';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDateTime } from '@/lib/format';
import { roughCalibrationFactor } from '@/lib/photometry';

export const metadata = { title: 'Camera profiles' };

export default async function CameraProfilesPage() {
  const actor = await requireActor();
  if (!can(actor.role, 'capture.read')) forbidden();
  const write = can(actor.role, 'camera.write');
  const profiles = await listCameraProfiles(actor.labId);
  const rough = roughCalibrationFactor();
  return (
    <div className="space-y-6">
      <Panel title="Camera profiles">
        <p className="mb-3 text-sm text-muted">
          A profile turns a camera’s photos into cd/m². It is found by the make and model in the on photo’s EXIF. Photos from cameras without a profile are measured relative only, with a rough estimate from the meter equation (K = 12.5), labelled as such.
        </p>
        {profiles.length === 0 ? (
          <EmptyState title="No camera calibrated yet">{write ? 'Calibrate one below.' : 'An admin can calibrate the lab’s cameras.'}</EmptyState>
        ) : (
          <ul className="divide-y divide-line" data-testid="camera-profiles">
            {profiles.map((p) => (
              <li key={p.id} className="flex flex-wrap items-start justify-between gap-3 py-3 text-sm" data-testid={`camera-${p.make}-${p.model}`.replace(/\s+/g, '-')}>
                <div className="space-y-1">
                  <div>
                    <span className="font-medium">{p.name}</span> <span className="text-muted">· {p.make} / {p.model}</span>
                  </div>
                  <div className="font-mono text-xs">
                    k = {p.k.toPrecision(4)} cd/m² per unit of Y·N²/(t·S) <span className="text-muted">({(p.k / rough).toFixed(2)} × the rough estimate)</span>
                  </div>
                  <div className="text-xs text-muted">
                    Patch {p.calibration.patch.w} × {p.calibration.patch.h} px at {p.calibration.patch.x}, {p.calibration.patch.y} of {p.calibration.photoName} · meter {p.calibration.meterCdm2} cd/m² · f/{p.calibration.exposure.fNumber}, {p.calibration.exposure.exposureTime < 1 ? `1/${Math.round(1 / p.calibration.exposure.exposureTime)}` : p.calibration.exposure.exposureTime} s, ISO {p.calibration.exposure.iso} · {formatDateTime(p.updatedAt)} UTC
                  </div>
                  <div className="text-xs">
                    {p.linearity ? (
                      p.linearity.linear ? (
                        <span className="text-pass">Linearity checked: exponent {p.linearity.exponent.toFixed(3)}</span>
                      ) : (
                        <span className="text-fail">Tone curve found: exponent {p.linearity.exponent.toFixed(3)} — JPEGs unfit for photometry</span>
                      )
                    ) : (
                      <span className="text-warn">Linearity not checked</span>
                    )}
                  </div>
                  <div className="text-xs text-muted" data-testid="camera-angle">
                    {p.degreesPerPixel === null ? 'Angle per pixel not measured: the field of view comes from the EXIF focal length' : `${p.degreesPerPixel}° per pixel, measured on a target of known angle`}
                  </div>
                  {write ? <DegreesPerPixelForm id={p.id} value={p.degreesPerPixel} /> : null}
                </div>
                {write ? <DeleteProfileButton id={p.id} name={p.name} /> : null}
              </li>
            ))}
          </ul>
        )}
      </Panel>
      {write ? (
        <>
          <Panel title="Calibrate a camera">
            <CalibrationForm />
          </Panel>
          <Panel title="Linearity check">
            <LinearityForm />
          </Panel>
        </>
      ) : null}
      <Notice tone="info">Never point the camera, a magnifier or the optics at the sun: lenses concentrate sunlight and can burn skin and displays and permanently damage eyes. Calibrated readings are engineering estimates, not certification.</Notice>
    </div>
  );
}
