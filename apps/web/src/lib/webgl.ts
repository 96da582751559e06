// Whether the browser gives a WebGL context at all: the 3D views (geometry, mode shapes) need one
// and fall back to a flat drawing without it. Plot traces ask the stricter lib/decimate.ts `webglUsable`.
export function webglAvailable(): boolean {
  try {
    const canvas = document.createElement('canvas');
    return Boolean(canvas.getContext('webgl2') ?? canvas.getContext('webgl'));
  } catch {
    return false;
  }
}
