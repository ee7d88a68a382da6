/**
 * The sky view's camera: screen pixels against the sky frame (tangent plane about the galaxy centre;
 * xi East, eta North, arcsec). The view is drawn as the sky is seen: North up, East to the left,
 * so screen x = cx - (xi - centreXi) * scale and screen y = cy - (eta - centreEta) * scale.
 */
export interface Camera {
  centreXiArcsec: number;
  centreEtaArcsec: number;
  /** Screen pixels per arcsec. */
  pxPerArcsec: number;
  widthPx: number;
  heightPx: number;
}

export const MIN_PX_PER_ARCSEC = 0.005;
export const MAX_PX_PER_ARCSEC = 40;

/** Sky frame (xi East, eta North; arcsec) to screen pixels. */
export function skyToScreen(cam: Camera, xiArcsec: number, etaArcsec: number): { x: number; y: number } {
  return {
    x: cam.widthPx / 2 - (xiArcsec - cam.centreXiArcsec) * cam.pxPerArcsec,
    y: cam.heightPx / 2 - (etaArcsec - cam.centreEtaArcsec) * cam.pxPerArcsec,
  };
}

/** Screen pixels to the sky frame (xi East, eta North; arcsec); the inverse of skyToScreen. */
export function screenToSky(cam: Camera, x: number, y: number): { xiArcsec: number; etaArcsec: number } {
  return {
    xiArcsec: cam.centreXiArcsec - (x - cam.widthPx / 2) / cam.pxPerArcsec,
    etaArcsec: cam.centreEtaArcsec - (y - cam.heightPx / 2) / cam.pxPerArcsec,
  };
}

/** Move the camera by a screen displacement (dx, dy) in pixels: the sky follows the pointer. */
export function panBy(cam: Camera, dxPx: number, dyPx: number): Camera {
  return { ...cam, centreXiArcsec: cam.centreXiArcsec + dxPx / cam.pxPerArcsec, centreEtaArcsec: cam.centreEtaArcsec + dyPx / cam.pxPerArcsec };
}

/** Zoom by `factor` keeping the sky point under screen (x, y) fixed. */
export function zoomAt(cam: Camera, factor: number, x: number, y: number): Camera {
  const scale = Math.min(MAX_PX_PER_ARCSEC, Math.max(MIN_PX_PER_ARCSEC, cam.pxPerArcsec * factor));
  const before = screenToSky(cam, x, y);
  const next = { ...cam, pxPerArcsec: scale };
  const after = screenToSky(next, x, y);
  return { ...next, centreXiArcsec: next.centreXiArcsec + before.xiArcsec - after.xiArcsec, centreEtaArcsec: next.centreEtaArcsec + before.etaArcsec - after.etaArcsec };
}

/** A camera that shows a circle of `radiusArcsec` about the sky-frame origin with a margin. */
export function fitCamera(widthPx: number, heightPx: number, radiusArcsec: number): Camera {
  const px = Math.max(MIN_PX_PER_ARCSEC, Math.min(MAX_PX_PER_ARCSEC, (0.46 * Math.min(widthPx, heightPx)) / Math.max(radiusArcsec, 1)));
  return { centreXiArcsec: 0, centreEtaArcsec: 0, pxPerArcsec: px, widthPx, heightPx };
}

/** Konva rotation in degrees for a group whose local frame is the mask frame at paDeg (x dispersion, y slits). */
export function maskGroupRotationDeg(paDeg: number): number {
  // Screen = R(180) * scale * (mask centre + R(-PA) * (x, y)): see the header for the screen axes.
  return 180 - paDeg;
}

/** A "nice" scale-bar length in arcmin (1, 2, 5 x 10^k) near `targetPx` pixels at this scale. */
export function scaleBarArcmin(pxPerArcsec: number, targetPx = 140): number {
  const arcmin = targetPx / (pxPerArcsec * 60);
  const p = Math.pow(10, Math.floor(Math.log10(arcmin)));
  const m = arcmin / p;
  const nice = m >= 5 ? 5 : m >= 2 ? 2 : 1;
  return nice * p;
}
