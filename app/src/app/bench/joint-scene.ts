import {
  BoxGeometry,
  Color,
  CylinderGeometry,
  DirectionalLight,
  Group,
  HemisphereLight,
  type Material,
  Mesh,
  MeshStandardMaterial,
  PerspectiveCamera,
  Scene,
  WebGLRenderer,
} from 'three';

/**
 * Whether this browser can give the WebGL2 context three.js needs. Asked before building the scene
 * so a browser without it gets our message rather than a console error from the renderer.
 */
export function canUseWebGL2(): boolean {
  try {
    const context = document.createElement('canvas').getContext('webgl2');
    // Hand the probe context back at once: browsers cap the number of live contexts.
    context?.getExtension('WEBGL_lose_context')?.loseContext();
    return context !== null;
  } catch {
    return false;
  }
}

/** Link length from the joint axis to its tip, scene units. */
const LINK_LENGTH = 2.2;
const HOUSING_RADIUS = 0.7;

/**
 * A joint drawn with three.js: a base, a motor housing whose axis is the joint axis (scene z,
 * toward the viewer), a fixed zero-angle mark and a link that turns about the axis by the joint angle.
 */
export class JointScene {
  readonly canvas: HTMLCanvasElement;
  private readonly renderer: WebGLRenderer;
  private readonly scene = new Scene();
  private readonly camera = new PerspectiveCamera(35, 1, 0.1, 100);
  private readonly linkPivot = new Group();
  private drawnAngle: number | null = null;

  /** Throws when the browser cannot give a WebGL context; the caller shows a message instead. */
  constructor() {
    // preserveDrawingBuffer keeps the last frame readable, so tests can prove the canvas is drawn.
    this.renderer = new WebGLRenderer({ antialias: true, preserveDrawingBuffer: true });
    this.renderer.setPixelRatio(Math.min(globalThis.devicePixelRatio || 1, 2));
    this.canvas = this.renderer.domElement;
    // resize() sets the drawing-buffer size only; CSS makes the canvas fill its host.
    Object.assign(this.canvas.style, { display: 'block', width: '100%', height: '100%' });
    this.build();
  }

  /** The angle last drawn, rad; null before the first render. */
  get angle(): number | null {
    return this.drawnAngle;
  }

  /** Draws the joint at `angle` rad; does nothing when that angle is already on screen. */
  showAngle(angle: number): boolean {
    if (angle === this.drawnAngle) return false;
    this.linkPivot.rotation.z = angle;
    this.drawnAngle = angle;
    this.renderer.render(this.scene, this.camera);
    return true;
  }

  /** Fits the drawing to the host's CSS size and redraws. */
  resize(width: number, height: number): void {
    if (width <= 0 || height <= 0) return;
    this.renderer.setSize(width, height, false);
    this.camera.aspect = width / height;
    this.camera.updateProjectionMatrix();
    this.renderer.render(this.scene, this.camera);
  }

  /** Frees every geometry, material and the WebGL context. */
  dispose(): void {
    const materials = new Set<Material>();
    this.scene.traverse((object) => {
      if (object instanceof Mesh) {
        object.geometry.dispose();
        for (const material of Array.isArray(object.material) ? object.material : [object.material]) materials.add(material);
      }
    });
    for (const material of materials) material.dispose();
    this.scene.clear();
    this.renderer.dispose();
    // Browsers cap live WebGL contexts; give this one back now rather than at garbage collection.
    this.renderer.forceContextLoss();
    this.canvas.remove();
  }

  private build(): void {
    this.scene.background = new Color(0xeef3f4);
    this.camera.position.set(1.6, 1.8, 7.5);
    this.camera.lookAt(0.7, -0.2, 0);

    this.scene.add(new HemisphereLight(0xffffff, 0x4a5659, 1.4));
    const key = new DirectionalLight(0xffffff, 2.2);
    key.position.set(4, 6, 8);
    this.scene.add(key);

    const steel = new MeshStandardMaterial({ color: 0x37474f, roughness: 0.7, metalness: 0.2 });
    const housingPaint = new MeshStandardMaterial({ color: 0x1f6f78, roughness: 0.45, metalness: 0.35 });
    const copper = new MeshStandardMaterial({ color: 0xc0762f, roughness: 0.35, metalness: 0.5 });
    const light = new MeshStandardMaterial({ color: 0xeceff1, roughness: 0.5 });

    const base = new Mesh(new BoxGeometry(2.6, 0.35, 1.8), steel);
    base.position.set(0, -1.55, -0.2);
    const pedestal = new Mesh(new BoxGeometry(0.8, 0.9, 0.8), steel);
    pedestal.position.set(0, -0.95, -0.2);

    // CylinderGeometry runs along y; turn it so its axis is the joint axis (z).
    const housing = new Mesh(new CylinderGeometry(HOUSING_RADIUS, HOUSING_RADIUS, 1, 48), housingPaint);
    housing.rotation.x = Math.PI / 2;
    housing.position.z = -0.2;

    const zeroMark = new Mesh(new BoxGeometry(0.5, 0.05, 0.05), light);
    zeroMark.position.set(HOUSING_RADIUS + 0.3, 0, 0.3);

    const link = new Mesh(new BoxGeometry(LINK_LENGTH, 0.28, 0.22), copper);
    link.position.set(LINK_LENGTH / 2, 0, 0.45);
    const hub = new Mesh(new CylinderGeometry(0.22, 0.22, 0.34, 32), light);
    hub.rotation.x = Math.PI / 2;
    hub.position.z = 0.45;
    this.linkPivot.add(link, hub);

    this.scene.add(base, pedestal, housing, zeroMark, this.linkPivot);
  }
}
