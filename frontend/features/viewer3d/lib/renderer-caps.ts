/**
 * Whether WebGL runs on a software rasteriser (SwiftShader, llvmpipe: machines and VMs
 * without a GPU, headless browsers). There multisampling costs several times the frame,
 * so the view draws without it; on a GPU it keeps its smooth edges.
 */
let cached: boolean | null = null;

export function isSoftwareRenderer(): boolean {
  if (cached !== null) return cached;
  cached = false;
  try {
    const canvas = document.createElement("canvas");
    const gl = (canvas.getContext("webgl2") ?? canvas.getContext("webgl")) as WebGLRenderingContext | null;
    if (!gl) return cached;
    const info = gl.getExtension("WEBGL_debug_renderer_info");
    const name = String(info ? gl.getParameter(info.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
    cached = /swiftshader|llvmpipe|softpipe|software|basic render/i.test(name);
    gl.getExtension("WEBGL_lose_context")?.loseContext();
  } catch {
    cached = false;
  }
  return cached;
}
