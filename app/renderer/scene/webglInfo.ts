/**
 * Whether WebGL runs on a software rasteriser (SwiftShader, llvmpipe, Microsoft Basic Render
 * Driver ...), read from the WEBGL_debug_renderer_info extension of a context: the one given,
 * or a throwaway one. Unknown (no extension) counts as hardware.
 */
const SOFTWARE = /swiftshader|llvmpipe|softpipe|software|basic render/i;

export function isSoftwareRenderer(context?: WebGLRenderingContext | WebGL2RenderingContext | null, doc: Document = document): boolean {
  try {
    const own = !context;
    const gl =
      context ?? ((doc.createElement('canvas').getContext('webgl2') ?? doc.createElement('canvas').getContext('webgl')) as WebGLRenderingContext | null);
    if (!gl) return false;
    const ext = gl.getExtension('WEBGL_debug_renderer_info');
    const name = ext ? String(gl.getParameter(ext.UNMASKED_RENDERER_WEBGL)) : String(gl.getParameter(gl.RENDERER));
    if (own) gl.getExtension('WEBGL_lose_context')?.loseContext();
    return SOFTWARE.test(name);
  } catch {
    return false;
  }
}
