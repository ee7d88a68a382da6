/** A picture drawn under the overlays of the sky view (e.g. a FITS image placed by its WCS). */
import type { TangentCentre } from '../../core/sky/tangentPlane';
import type { Camera } from './camera';

export interface Backdrop {
  /** Draw in screen pixels for camera `cam`; `centre` is the sky view's projection centre (the galaxy). */
  draw(ctx: CanvasRenderingContext2D, cam: Camera, centre: TangentCentre): void;
}
