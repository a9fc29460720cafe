/**
 * Whether WebGL runs on a software rasteriser (SwiftShader, llvmpipe, Microsoft Basic Render
 * Driver ...), read from the WEBGL_debug_renderer_info extension of a throwaway context.
 * Unknown (no extension) counts as hardware.
 */
const SOFTWARE = /swiftshader|llvmpipe|softpipe|software|basic render/i;

export function isSoftwareRenderer(doc: Document = document): boolean {
  try {
    const c = doc.createElement('canvas');
    const gl = (c.getContext('webgl2') ?? c.getContext('webgl')) as WebGLRenderingContext | null;
    if (!gl) return false;
    const ext = gl.getExtension('WEBGL_debug_renderer_info');
    const name = ext ? String(gl.getParameter(ext.UNMASKED_RENDERER_WEBGL)) : String(gl.getParameter(gl.RENDERER));
    gl.getExtension('WEBGL_lose_context')?.loseContext();
    return SOFTWARE.test(name);
  } catch {
    return false;
  }
}
