import { NextResponse } from 'next/server';
import { saveCameraLinearity } from '@/db/queries/camera-profiles';
import { withAuth } from '@/lib/server/auth/with-auth';
import { fitLinearity, readGreySteps } from '@/lib/photometry';
import { GREY_STEP_LINEAR, GREY_STEPS } from '@/lib/patterns';
import { linearityFormSchema, type LinearityDetails } from '@/lib/schemas/camera-profile';
import { asInputError, readCameraForm } from '../intake';

// A photo of the grey-steps pattern → measured steps against the expected, the fitted exponent
// and, when the camera bends its tones, the warning; kept on the camera's profile when it has one.
export const POST = withAuth(
  async (req, { actor }) => {
    const { photo, fields } = await readCameraForm(req);
    const f = linearityFormSchema.parse(Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== '')));
    const { width, height } = photo.raster;
    const area = f.x !== undefined && f.y !== undefined && f.w !== undefined && f.h !== undefined ? { x: f.x, y: f.y, w: f.w, h: f.h } : { x: 0, y: 0, w: width, h: height };
    let fit;
    let steps;
    try {
      steps = readGreySteps(photo.raster, area, GREY_STEPS.length);
      fit = fitLinearity(steps.levels, GREY_STEP_LINEAR, steps.clipped);
    } catch (e) {
      asInputError(e);
    }
    const details: LinearityDetails = {
      exponent: fit.exponent,
      maxDeviation: fit.maxDeviation,
      linear: fit.linear,
      warning: fit.warning,
      levels: fit.normalised.map((v) => (Number.isFinite(v) ? v : null)),
      expected: fit.expected,
      checkedAt: new Date().toISOString(),
    };
    const make = photo.exposure?.make;
    const model = photo.exposure?.model;
    const profile = make && model ? await saveCameraLinearity(actor.labId, actor.user.id, make, model, details) : null;
    return NextResponse.json({ linearity: details, clipped: steps.clipped, used: fit.used, camera: make && model ? { make, model } : null, savedTo: profile ? { id: profile.id, name: profile.name } : null });
  },
  { permission: 'camera.write' },
);
