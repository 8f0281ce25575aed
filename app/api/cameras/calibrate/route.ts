import { NextResponse } from 'next/server';
import { saveCameraCalibration } from '@/db/queries/camera-profiles';
import { withAuth } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { calibrateFromPatch, roughCalibrationFactor } from '@/lib/photometry';
import { calibrationFormSchema } from '@/lib/schemas/camera-profile';
import { asInputError, readCameraForm } from '../intake';

// A photo of a patch, the patch's rectangle and a spot meter's reading of it → the camera's k.
export const POST = withAuth(
  async (req, { actor }) => {
    const { photo, name, fields } = await readCameraForm(req);
    const input = calibrationFormSchema.parse(fields);
    const make = photo.exposure?.make || input.make;
    const model = photo.exposure?.model || input.model;
    if (!make || !model) throw new AppError(422, 'The photo’s EXIF names no camera make and model: type them in, exactly as your camera writes them', 'invalid', { make: ['Give the make'], model: ['Give the model'] });
    const patch = { x: input.x, y: input.y, w: input.w, h: input.h };
    let cal;
    try {
      cal = calibrateFromPatch(photo.raster, patch, photo.exposure, input.meterCdm2);
    } catch (e) {
      asInputError(e);
    }
    const tags = photo.exposure ?? {};
    const profile = await saveCameraCalibration(actor.labId, actor.user.id, {
      make,
      model,
      name: input.name || `${make} ${model}`,
      k: cal.k,
      calibration: {
        patch,
        meterCdm2: input.meterCdm2,
        meanY: cal.meanY,
        exposure: { exposureTime: tags.exposureTime as number, fNumber: tags.fNumber as number, iso: tags.iso as number, factor: cal.exposure },
        photoName: name,
        imageWidth: photo.raster.width,
        imageHeight: photo.raster.height,
      },
    });
    return NextResponse.json({ profile, roughK: roughCalibrationFactor() }, { status: 201 });
  },
  { permission: 'camera.write' },
);
