/**
 * The System view's imperative three.js code (the Svelte component only creates it and passes
 * data in). Everything that depends on the system or the result is built once per change of
 * either; moving the time cursor only moves objects and rescales markers, so a scrub frame is
 * a handful of ephemeris evaluations plus one render.
 *
 * Precision: positions are kept in metres in double precision and written to the GPU relative
 * to a floating origin, the focused object ("render relative to eye", common practice for
 * planet-scale scenes), so the parking orbit around a planet 10¹¹ m from the star does not
 * jitter in 32-bit floats. A logarithmic depth buffer covers metres to light-hours.
 *
 * Sizes: with "scaled for visibility" on, each body is drawn at least MIN_PIXELS across
 * (its true radius when that is bigger); the ship, burn markers and Δv arrows keep a constant
 * size on screen. "True scale" draws bodies at their mean radius.
 */
import * as THREE from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import { CSS2DObject, CSS2DRenderer } from 'three/examples/jsm/renderers/CSS2DRenderer.js';
import type { BudgetRow, PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { bodyPosition, sampleOrbit } from '../../../core/system/index.ts';
import { planExtent } from './planExtent.ts';
import { burnToInertial } from '../../../core/plan/index.ts';
import { AXIS_STYLE, FRAME_AXES, PALETTE, bodyColour, type HeadShape, type ShaftStyle } from './palette.ts';
import { shipStateAt } from '../../../core/conic/index.ts';
import { isSoftwareRenderer } from './webglInfo.ts';
import { GAME_STYLE } from '../gamestep/style.ts';
import type { TrackPath } from '../gamestep/trackPaths.ts';
import { trackPosition, trackStateAt, type NBodySamples, type TruthPath } from '../target/truthTrack.ts';

/** Scene units per metre: one unit is 1 000 km. */
export const UNITS_PER_METRE = 1e-6;
const U = UNITS_PER_METRE;
/** Smallest drawn diameter in pixels, "scaled for visibility": star, planets, moons. */
export const MIN_PIXELS = { star: 18, planet: 9, moon: 6 } as const;
/** Screen sizes of the ship diamond, burn markers and Δv arrows, pixels. */
const SHIP_PX = 7;
const MARKER_PX = 5;
const ARROW_PX = 64;
/** Ring spacing of the reference-plane grid, m (100 Gm). */
export const GRID_RING = 1e11;
/** Points per body orbit line. */
const ORBIT_POINTS = 720;
/** Dashes along each game-step path. */
const GAME_DASHES = 90;

export type FocusTarget = { kind: 'body'; index: number } | { kind: 'ship' };

export interface SceneOptions {
  trueScale: boolean;
  showSoi: boolean;
  showOrbits: boolean;
  showLabels: boolean;
  showArrows: boolean;
}

export const DEFAULT_OPTIONS: SceneOptions = { trueScale: false, showSoi: true, showOrbits: true, showLabels: true, showArrows: true };

interface BodyView {
  group: THREE.Group;
  mesh: THREE.Mesh;
  /** The SOI shell's outline as seen from the camera (a circle kept facing it), or null. */
  soi: THREE.LineLoop | null;
  orbit: THREE.LineLoop | null;
  label: CSS2DObject;
  radius: number;
  soiRadius: number;
  minPx: number;
  parent: number;
  depth: number;
}

interface BurnMarker {
  /** Everything the marker is drawn from (the next result reuses a marker with the same key). */
  key: string;
  /** Central body whose frame the marker sits in, and its position relative to it (m). */
  central: number;
  rel: THREE.Vector3;
  group: THREE.Group;
  arrows: THREE.Group;
  rowId: string;
  /** Placed on the truth model's n-body flight (not on the patched-conic path). */
  onTrack: boolean;
}

/** The line of one segment of the result: kept for the next result, whose segment in the same place rewrites its positions. */
interface SegmentLine {
  burn: boolean;
  geometry: THREE.BufferGeometry;
  positions: THREE.BufferAttribute;
  /** A coast's line, or a burn's group of a line and beads. */
  object: THREE.Object3D;
}

/** What one frame cost, for the status line and the scrub benchmark. */
export interface FrameStats {
  /** JS time of the last frame: scene update plus render calls, ms. */
  lastMs: number;
  frames: number;
}

function makeLabel(text: string, cls: string, onClick?: () => void): CSS2DObject {
  const el = document.createElement('div');
  el.className = `scene-label ${cls}`;
  el.textContent = text;
  if (onClick) {
    el.style.pointerEvents = 'auto';
    el.addEventListener('click', (e) => {
      e.stopPropagation();
      onClick();
    });
  }
  const obj = new CSS2DObject(el);
  obj.center.set(-0.08, 1.1);
  return obj;
}

function glowTexture(colour: string): THREE.CanvasTexture {
  const c = document.createElement('canvas');
  c.width = c.height = 128;
  const g = c.getContext('2d')!;
  const grad = g.createRadialGradient(64, 64, 0, 64, 64, 64);
  const col = new THREE.Color(colour);
  const rgb = `${Math.round(col.r * 255)},${Math.round(col.g * 255)},${Math.round(col.b * 255)}`;
  grad.addColorStop(0, `rgba(${rgb},0.85)`);
  grad.addColorStop(0.25, `rgba(${rgb},0.35)`);
  grad.addColorStop(1, `rgba(${rgb},0)`);
  g.fillStyle = grad;
  g.fillRect(0, 0, 128, 128);
  const tex = new THREE.CanvasTexture(c);
  tex.colorSpace = THREE.SRGBColorSpace;
  return tex;
}

/**
 * Materials and geometries of the plan's drawing, made once per scene and shared by every
 * rebuild: disposing the last user of a material would free its shader program, and the next
 * edit would compile it again (tens of ms on a software rasteriser).
 */
class SharedDrawing {
  readonly coast = new THREE.LineBasicMaterial({ color: PALETTE.path, transparent: true, opacity: 0.95 });
  readonly nbody = new THREE.LineDashedMaterial({ color: PALETTE.nbody, dashSize: 1, gapSize: 0.6 });
  /** The plan's path in its truth model when that is n-body (the main path, as solid as a coast). */
  readonly truthLine = new THREE.LineBasicMaterial({ color: PALETTE.path });
  /** A path shown as the comparison (the patched-conic flight beside the truth model's): faint. */
  readonly comparison = new THREE.LineBasicMaterial({ color: PALETTE.muted, transparent: true, opacity: 0.45 });
  /** The legs of the sequence solution picked in the Windows screen (Lambert arcs): amber dashes. */
  readonly sequenceLine = new THREE.LineDashedMaterial({ color: PALETTE.warn, dashSize: 1, gapSize: 0.5 });
  /** The game-step check's flight (dashes in units of its own length, see setGameStep) and its reference. */
  readonly gameLine = new THREE.LineDashedMaterial({ color: GAME_STYLE.game, dashSize: 0.6, gapSize: 0.4 });
  readonly gameReference = new THREE.LineBasicMaterial({ color: GAME_STYLE.reference, transparent: true, opacity: 0.5 });
  /** Beads at the game-step samples, so its path reads apart from the plan's line it lies on. */
  readonly gameDots = new THREE.PointsMaterial({ color: GAME_STYLE.game, size: 3, sizeAttenuation: false });
  readonly burnLine = new THREE.LineBasicMaterial({ color: PALETTE.burn });
  readonly burnDots = new THREE.PointsMaterial({ color: PALETTE.burn, size: 4.5, sizeAttenuation: false });
  readonly markerDot = new THREE.MeshBasicMaterial({ color: PALETTE.burn });
  readonly markerRing = new THREE.MeshBasicMaterial({ color: PALETTE.burn, side: THREE.DoubleSide, transparent: true, opacity: 0.7 });
  readonly dotGeometry = new THREE.SphereGeometry(1, 12, 8);
  /** Unit circle in the x–y plane (SOI outlines). */
  readonly circle = new THREE.BufferGeometry().setFromPoints(
    Array.from({ length: 160 }, (_, k) => new THREE.Vector3(Math.cos((2 * Math.PI * k) / 160), Math.sin((2 * Math.PI * k) / 160), 0)),
  );
  readonly ringGeometry = new THREE.RingGeometry(1.6, 2.1, 24);
  /** Arrow shaft from the origin to (0, 1, 0); heads of unit size with their tip at the origin, pointing +y. */
  readonly shaft = new THREE.BufferGeometry().setAttribute('position', new THREE.Float32BufferAttribute([0, 0, 0, 0, 1, 0], 3));
  readonly head = new THREE.ConeGeometry(0.5, 1, 10, 1).translate(0, -0.5, 0);
  readonly diamond = new THREE.OctahedronGeometry(0.5, 0).translate(0, -0.5, 0);
  /** A flat plate across the shaft's end (seen edge-on: a bar). */
  readonly bar = new THREE.BoxGeometry(1, 0.3, 1).translate(0, -0.15, 0);
  readonly hues = new Map<string, { line: THREE.LineBasicMaterial; mesh: THREE.MeshBasicMaterial; dots: THREE.PointsMaterial }>();

  arrowMaterials(hue: string): { line: THREE.LineBasicMaterial; mesh: THREE.MeshBasicMaterial; dots: THREE.PointsMaterial } {
    let m = this.hues.get(hue);
    if (!m) {
      m = {
        line: new THREE.LineBasicMaterial({ color: hue }),
        mesh: new THREE.MeshBasicMaterial({ color: hue }),
        dots: new THREE.PointsMaterial({ color: hue, size: 2.5, sizeAttenuation: false }),
      };
      this.hues.set(hue, m);
    }
    return m;
  }

  /**
   * An arrow along unit vector `dir`, `length` long (ArrowHelper's layout with shared materials):
   * its shaft solid, dashed (dashes of 0.09 with gaps of 0.05 of the arrow's unit) or dotted
   * (dots every 0.1), and its head a cone, a diamond or a bar (palette.ts AXIS_STYLE).
   */
  arrow(dir: THREE.Vector3, length: number, style: { hue: string; shaft: ShaftStyle; head: HeadShape }, headLength: number, headWidth: number): THREE.Object3D {
    const m = this.arrowMaterials(style.hue);
    const g = new THREE.Group();
    const run = Math.max(1e-4, length - headLength);
    if (style.shaft === 'solid') {
      const shaft = new THREE.Line(this.shaft, m.line);
      shaft.scale.set(1, run, 1);
      g.add(shaft);
    } else {
      // dash and dot spacing in the arrow's own units (constant on screen), so a short arrow keeps its pattern
      const xyz: number[] = [];
      if (style.shaft === 'dashed') {
        for (let y = 0; y < run; y += 0.14) xyz.push(0, y, 0, 0, Math.min(run, y + 0.09), 0);
      } else {
        for (let y = 0; y <= run; y += 0.1) xyz.push(0, y, 0);
      }
      const geo = new THREE.BufferGeometry().setAttribute('position', new THREE.Float32BufferAttribute(xyz, 3));
      g.add(style.shaft === 'dashed' ? new THREE.LineSegments(geo, m.line) : new THREE.Points(geo, m.dots));
    }
    const headGeo = style.head === 'cone' ? this.head : style.head === 'diamond' ? this.diamond : this.bar;
    const head = new THREE.Mesh(headGeo, m.mesh);
    if (style.head === 'diamond') head.scale.set(headWidth * 1.5, headLength * 1.2, headWidth * 1.5);
    else if (style.head === 'bar') head.scale.set(headWidth * 2.2, headLength * 0.6, headWidth * 2.2);
    else head.scale.set(headWidth, headLength, headWidth);
    head.position.y = length;
    g.add(head);
    g.quaternion.setFromUnitVectors(new THREE.Vector3(0, 1, 0), dir);
    return g;
  }

  dispose(): void {
    for (const x of [
      this.coast,
      this.nbody,
      this.truthLine,
      this.comparison,
      this.sequenceLine,
      this.gameLine,
      this.gameReference,
      this.gameDots,
      this.burnLine,
      this.burnDots,
      this.markerDot,
      this.markerRing,
      this.dotGeometry,
      this.ringGeometry,
      this.shaft,
      this.head,
      this.diamond,
      this.bar,
      this.circle,
    ])
      x.dispose();
    for (const m of this.hues.values()) {
      m.line.dispose();
      m.mesh.dispose();
      m.dots.dispose();
    }
  }
}

export class SystemScene {
  readonly renderer: THREE.WebGLRenderer;
  readonly labels: CSS2DRenderer;
  readonly camera: THREE.PerspectiveCamera;
  readonly controls: OrbitControls;
  readonly stats: FrameStats = { lastMs: 0, frames: 0 };
  /** WebGL runs on a software rasteriser (no GPU). */
  readonly software: boolean;
  /** Called after every rendered frame. */
  onFrame: ((stats: FrameStats) => void) | null = null;
  /** Camera moves the user has started (drags, wheel), counted: a framing the user has not touched can be redone. */
  userMoves = 0;
  /** Called when a label is clicked (the component turns it into a focus change). */
  onPick: ((target: FocusTarget) => void) | null = null;

  private scene = new THREE.Scene();
  private shared = new SharedDrawing();
  private system: StarSystem | null = null;
  private result: PlanResult | null = null;
  private bodies: BodyView[] = [];
  private systemRoot = new THREE.Group();
  private resultRoot = new THREE.Group();
  /** One group per central body for the trajectory and markers drawn in that body's frame. */
  private frames = new Map<number, THREE.Group>();
  private markers: BurnMarker[] = [];
  /** The result's segment lines, in the order of its drawn segments. */
  private segmentLines: SegmentLine[] = [];
  private ship: THREE.Mesh;
  private shipLabel: CSS2DObject;
  private starLight = new THREE.PointLight(0xffffff, 2.6, 0, 0);
  private glow: THREE.Sprite | null = null;
  /** The n-body verification's path (positions relative to the star), or null. */
  private nbodyLine: THREE.Line | null = null;
  /** The game-step check's paths, one group per central body (positioned like `frames`). */
  private gameRoot = new THREE.Group();
  private gameFrames = new Map<number, THREE.Group>();
  /** The plan's n-body path in its truth model, one group per central body (positioned like `frames`). */
  private truthRoot = new THREE.Group();
  private truthFrames = new Map<number, THREE.Group>();
  /** The n-body flight the ship follows and the burn markers sit on (positions relative to the star), or null. */
  private track: Pick<NBodySamples, 't' | 'star' | 'origin'> | null = null;
  /** A patched-conic flight drawn as the comparison, per central body. */
  private comparisonRoot = new THREE.Group();
  private comparisonFrames = new Map<number, THREE.Group>();
  /** The legs of the picked sequence solution, per central body. */
  private sequenceRoot = new THREE.Group();
  private sequenceFrames = new Map<number, THREE.Group>();
  /** The result's own path is drawn as the comparison (the truth model's path is the main one). */
  private resultIsComparison = false;
  private grid: THREE.Object3D | null = null;

  private t = 0;
  private focus: FocusTarget = { kind: 'body', index: 0 };
  private options: SceneOptions = { ...DEFAULT_OPTIONS };
  private raf = 0;
  private disposed = false;

  // Scratch (double precision): body positions relative to the star, ship state, origin.
  private world = new Float64Array(0);
  private ship6 = new Float64Array(6);
  private shipWorld = new Float64Array(3);
  private shipCentral = -1;
  private tmp3 = new Float64Array(3);
  private origin = new Float64Array(3);
  private v = new THREE.Vector3();

  constructor(private readonly container: HTMLElement) {
    // Multisampling roughly doubles the frame time of a software rasteriser (SwiftShader,
    // llvmpipe): off there, on with a GPU. The renderer is made without it and asked what it
    // runs on; with a GPU it is made again with it (a second context is cheap there, and a
    // software rasteriser is spared one).
    const make = (antialias: boolean) => new THREE.WebGLRenderer({ antialias, logarithmicDepthBuffer: true, powerPreference: 'high-performance' });
    let renderer = make(false);
    this.software = isSoftwareRenderer(renderer.getContext());
    if (!this.software) {
      renderer.dispose();
      renderer.forceContextLoss();
      renderer = make(true);
    }
    this.renderer = renderer;
    this.renderer.setPixelRatio(Math.min(window.devicePixelRatio || 1, 2));
    this.renderer.setClearColor(new THREE.Color(PALETTE.ground), 1);
    this.renderer.domElement.className = 'scene-canvas';
    container.append(this.renderer.domElement);

    this.labels = new CSS2DRenderer();
    this.labels.domElement.className = 'scene-labels';
    container.append(this.labels.domElement);

    this.camera = new THREE.PerspectiveCamera(40, 1, 1e-4, 1e9);
    this.camera.position.set(0, -4e5, 2.4e5);
    this.camera.up.set(0, 0, 1);
    this.controls = new OrbitControls(this.camera, this.renderer.domElement);
    this.controls.target.set(0, 0, 0);
    this.controls.minDistance = 1e-3;
    this.controls.maxDistance = 5e7;
    this.controls.zoomSpeed = 1.4;
    this.controls.addEventListener('change', () => this.requestRender());
    this.controls.addEventListener('start', () => this.userMoves++);

    this.scene.add(new THREE.AmbientLight(0xffffff, 0.22));
    this.scene.add(this.starLight);
    this.scene.add(this.systemRoot, this.resultRoot, this.gameRoot, this.truthRoot, this.comparisonRoot, this.sequenceRoot);

    this.ship = new THREE.Mesh(new THREE.OctahedronGeometry(1, 0), new THREE.MeshBasicMaterial({ color: PALETTE.ship }));
    this.ship.visible = false;
    this.shipLabel = makeLabel('ship', 'ship', () => this.onPick?.({ kind: 'ship' }));
    this.shipLabel.center.set(-0.12, -0.35); // below right of the ship, clear of body labels
    this.ship.add(this.shipLabel);
    this.scene.add(this.ship);
    this.resize();
  }

  // ---------------------------------------------------------------- building (on data change)

  setSystem(system: StarSystem): void {
    this.clearGroup(this.systemRoot);
    this.bodies = [];
    this.system = system;
    this.world = new Float64Array(3 * system.bodies.length);
    for (const b of system.bodies) {
      const colour = bodyColour(b.colour, b.index);
      const group = new THREE.Group();
      const isStar = b.index === 0;
      const mat = isStar
        ? new THREE.MeshBasicMaterial({ color: colour })
        : new THREE.MeshLambertMaterial({ color: colour, emissive: new THREE.Color(colour).multiplyScalar(0.08) });
      const mesh = new THREE.Mesh(new THREE.SphereGeometry(1, isStar ? 48 : 32, isStar ? 24 : 16), mat);
      group.add(mesh);
      let soi: THREE.LineLoop | null = null;
      if (!isStar && Number.isFinite(b.derived.soiRadius)) {
        soi = new THREE.LineLoop(
          this.shared.circle,
          new THREE.LineDashedMaterial({ color: colour, transparent: true, opacity: 0.55, dashSize: 0.035, gapSize: 0.025, depthWrite: false }),
        );
        soi.computeLineDistances();
        this.systemRoot.add(soi);
      }
      const label = makeLabel(b.name, `depth-${Math.min(b.derived.depth, 2)}`, () => this.onPick?.({ kind: 'body', index: b.index }));
      group.add(label);
      this.systemRoot.add(group);
      let orbit: THREE.LineLoop | null = null;
      if (!isStar) {
        const pts = sampleOrbit(system, b.index, ORBIT_POINTS);
        const f32 = new Float32Array(pts.length);
        for (let k = 0; k < pts.length; k++) f32[k] = pts[k] * U;
        const geo = new THREE.BufferGeometry();
        geo.setAttribute('position', new THREE.BufferAttribute(f32, 3));
        orbit = new THREE.LineLoop(geo, new THREE.LineBasicMaterial({ color: colour, transparent: true, opacity: b.derived.depth > 1 ? 0.22 : 0.34 }));
        this.systemRoot.add(orbit);
      }
      if (isStar) {
        this.glow = new THREE.Sprite(
          new THREE.SpriteMaterial({ map: glowTexture(colour), blending: THREE.AdditiveBlending, depthWrite: false, transparent: true }),
        );
        group.add(this.glow);
      }
      this.bodies.push({
        group,
        mesh,
        soi,
        orbit,
        label,
        radius: b.radius * U,
        soiRadius: b.derived.soiRadius * U,
        minPx: isStar ? MIN_PIXELS.star : b.derived.depth > 1 ? MIN_PIXELS.moon : MIN_PIXELS.planet,
        parent: b.parentIndex,
        depth: b.derived.depth,
      });
    }
    // A faint polar grid in the reference plane around the star, rings every GRID_RING metres.
    const outer = Math.max(...system.bodies.map((b) => (b.parentIndex === 0 ? b.derived.apoapsis : 0)), GRID_RING);
    const rings = Math.max(2, Math.ceil(outer / GRID_RING));
    const grid = new THREE.PolarGridHelper(rings * GRID_RING * U, 12, rings, 72, PALETTE.grid, PALETTE.grid);
    grid.rotation.x = Math.PI / 2; // the helper lies in x–z; the reference plane is x–y
    (grid.material as THREE.Material).transparent = true;
    (grid.material as THREE.Material).opacity = 0.7;
    this.grid = grid;
    this.systemRoot.add(grid);
    this.applyOptions();
    this.requestRender();
  }

  /**
   * Draws the plan's result. The drawing of the previous result is reused where it fits (an edit
   * changes a few segments and burns): each segment's line keeps its geometry and GPU buffer and
   * only its positions are rewritten; a burn marker drawn from the same figures is kept as is.
   */
  setResult(result: PlanResult | null, shipName = 'ship'): void {
    this.result = result;
    (this.shipLabel.element as HTMLElement).textContent = shipName;
    if (!result || !this.system) {
      this.clearResult();
      this.ship.visible = false;
      this.requestRender();
      return;
    }
    const old: (SegmentLine | null)[] = this.segmentLines;
    const lines: SegmentLine[] = [];
    for (const seg of result.segments) {
      const n = seg.sampleT.length;
      if (n < 2) continue;
      const burn = seg.kind === 'burn';
      const j = lines.length;
      let line = old[j] ?? null;
      if (line && line.burn === burn && line.positions.count >= n) old[j] = null;
      else line = this.segmentLine(burn, n);
      const pos = line.positions.array as Float32Array;
      for (let k = 0; k < 3 * n; k++) pos[k] = seg.samples[k] * U;
      // a longer buffer than the segment: its tail repeats the last point (not drawn; the bounds stay the segment's)
      for (let k = 3 * n; k < pos.length; k++) pos[k] = pos[k - 3];
      line.positions.needsUpdate = true;
      line.geometry.setDrawRange(0, n);
      line.geometry.boundingSphere = null;
      line.geometry.boundingBox = null;
      // Coasts: a thin mint line (faint when the truth model's path is the main one).
      if (!burn) (line.object as THREE.Line).material = this.resultIsComparison ? this.shared.comparison : this.shared.coast;
      line.object.userData.kind = seg.kind;
      this.resultFrame(seg.central).add(line.object);
      lines.push(line);
    }
    for (const line of old) if (line) this.dropSegmentLine(line);
    this.segmentLines = lines;
    this.placeMarkers();
    this.pruneFrames();
    this.ship.visible = true;
    this.applyOptions();
    this.requestRender();
  }

  /** A new segment line with room for `n` points. */
  private segmentLine(burn: boolean, n: number): SegmentLine {
    const geometry = new THREE.BufferGeometry();
    const positions = new THREE.BufferAttribute(new Float32Array(3 * n), 3);
    geometry.setAttribute('position', positions);
    let object: THREE.Object3D;
    if (burn) {
      // Finite burns: an amber line beaded with screen-size dots, so it reads as a bold band
      // (GL points and lines stay cheap on software rasterisers, unlike wide-line shaders).
      object = new THREE.Group();
      object.add(new THREE.Line(geometry, this.shared.burnLine));
      object.add(new THREE.Points(geometry, this.shared.burnDots));
    } else object = new THREE.Line(geometry, this.shared.coast);
    return { burn, geometry, positions, object };
  }

  private dropSegmentLine(line: SegmentLine): void {
    line.object.removeFromParent();
    line.geometry.dispose();
  }

  /** Removes the frames (groups per central body) left with nothing in them. */
  private pruneFrames(): void {
    for (const [c, g] of this.frames) {
      if (g.children.length === 0) {
        g.removeFromParent();
        this.frames.delete(c);
      }
    }
  }

  /** The group of the plan's drawing in `central`'s frame (made on first use). */
  private resultFrame(central: number): THREE.Group {
    let g = this.frames.get(central);
    if (!g) {
      g = new THREE.Group();
      this.frames.set(central, g);
      this.resultRoot.add(g);
    }
    return g;
  }

  /**
   * (Re)places the burn markers: on the truth model's n-body flight when there is one, else on the
   * result's path. A marker drawn from the same figures as one already there is kept.
   */
  private placeMarkers(): void {
    const old = new Map<string, BurnMarker>();
    for (const m of this.markers) {
      const twin = old.get(m.key);
      if (twin) this.dropMarker(twin); // two markers drawn alike: one is enough to reuse
      old.set(m.key, m);
    }
    this.markers = [];
    if (this.result) for (const row of this.result.budget.rows) this.addMarker(row, old);
    for (const m of old.values()) this.dropMarker(m);
  }

  /** Frees what a marker owns (its dashed or dotted shafts; dots, rings, heads and solid shafts are shared). */
  private dropMarker(m: BurnMarker): void {
    m.group.removeFromParent();
    const sh = this.shared;
    m.arrows.traverse((o) => {
      const g = (o as THREE.Mesh).geometry;
      if (g && g !== sh.shaft && g !== sh.head && g !== sh.diamond && g !== sh.bar) g.dispose();
    });
  }

  private addMarker(row: BudgetRow, reusable: Map<string, BurnMarker>): void {
    if (!this.result || !this.system) return;
    // State just before the burn: its frame axes are defined there.
    const s6 = new Float64Array(6);
    const tBefore = row.tStart - Math.max(1e-3, Math.abs(row.tStart) * 1e-12);
    let central = this.track ? trackStateAt(this.system, this.track, tBefore, s6) : -1;
    const onTrack = central >= 0;
    if (!onTrack) {
      const k = shipStateAt(this.result, tBefore, s6);
      if (k < 0) return;
      central = this.result.segments[k].central;
    }
    // what the marker is drawn from: the same key draws the same marker
    const key = `${row.planEventId}|${central}|${onTrack}|${row.frame}|${s6.join()}|${row.dvFrame.join()}|${row.dvInertial.join()}`;
    const same = reusable.get(key);
    if (same) {
      reusable.delete(key);
      this.resultFrame(central).add(same.group);
      this.markers.push(same);
      return;
    }
    const r = [s6[0], s6[1], s6[2]];
    const v = [s6[3], s6[4], s6[5]];
    const group = new THREE.Group();
    const dot = new THREE.Mesh(this.shared.dotGeometry, this.shared.markerDot);
    const ring = new THREE.Mesh(this.shared.ringGeometry, this.shared.markerRing);
    group.add(dot, ring);
    const arrows = new THREE.Group();
    const mag = Math.hypot(...row.dvFrame);
    if (mag > 0) {
      const axes = FRAME_AXES[row.frame];
      const axis = [0, 0, 0];
      for (let j = 0; j < 3; j++) {
        const c = row.dvFrame[j];
        if (Math.abs(c) < 1e-6 * mag) continue;
        axis[0] = axis[1] = axis[2] = 0;
        axis[j] = Math.sign(c);
        let dir: number[];
        try {
          dir = burnToInertial(row.frame, r, v, axis) as number[];
        } catch {
          continue; // degenerate frame (r ∥ v): no arrows for that axis
        }
        const len = 0.3 + 0.7 * (Math.abs(c) / mag);
        arrows.add(this.shared.arrow(new THREE.Vector3(dir[0], dir[1], dir[2]).normalize(), len, AXIS_STYLE[axes[j].role], 0.16, 0.08));
      }
      const d = row.dvInertial;
      const dm = Math.hypot(d[0], d[1], d[2]);
      if (dm > 0) arrows.add(this.shared.arrow(new THREE.Vector3(d[0] / dm, d[1] / dm, d[2] / dm), 1.12, AXIS_STYLE.total, 0.14, 0.07));
    }
    group.add(arrows);
    this.resultFrame(central).add(group);
    this.markers.push({ key, central, rel: new THREE.Vector3(r[0] * U, r[1] * U, r[2] * U), group, arrows, rowId: row.planEventId, onTrack });
  }

  /** Empties the plan's drawing: per-segment geometry is freed, shared materials and geometry kept. */
  private clearResult(): void {
    for (const line of this.segmentLines) this.dropSegmentLine(line);
    this.segmentLines = [];
    for (const m of this.markers) this.dropMarker(m);
    this.markers = [];
    this.resultRoot.clear();
    this.frames.clear();
  }

  private clearGroup(g: THREE.Group): void {
    g.traverse((o) => {
      const m = o as THREE.Mesh;
      if (m.geometry !== this.shared.circle) m.geometry?.dispose();
      const mat = m.material as THREE.Material | THREE.Material[] | undefined;
      if (Array.isArray(mat)) mat.forEach((x) => x.dispose());
      else mat?.dispose();
      if (o instanceof CSS2DObject) o.element.remove();
    });
    g.clear();
  }

  /** Draws (or, with null, removes) the n-body flight's path: positions relative to the star, m. */
  setNBody(starPositions: Float64Array | null): void {
    if (this.nbodyLine) {
      this.nbodyLine.geometry.dispose();
      this.nbodyLine.removeFromParent();
      this.nbodyLine = null;
    }
    if (starPositions && starPositions.length >= 6) {
      const f32 = new Float32Array(starPositions.length);
      for (let k = 0; k < f32.length; k++) f32[k] = starPositions[k] * U;
      const geo = new THREE.BufferGeometry();
      geo.setAttribute('position', new THREE.BufferAttribute(f32, 3));
      const line = new THREE.Line(geo, this.shared.nbody);
      line.computeLineDistances();
      // Dashes about 2 % of the path's extent long.
      geo.computeBoundingSphere();
      const scale = (geo.boundingSphere?.radius ?? 1) * 0.02;
      this.shared.nbody.dashSize = scale;
      this.shared.nbody.gapSize = scale * 0.6;
      this.nbodyLine = line;
      this.scene.add(line);
    }
    this.requestRender();
  }

  /**
   * Draws (or, with nulls, removes) the plan's path in its truth model when that is n-body: the
   * paths in their central bodies' frames (target/truthTrack.ts), and the flight the ship follows.
   */
  setTruthTrack(paths: TruthPath[] | null, track: Pick<NBodySamples, 't' | 'star' | 'origin'> | null): void {
    this.clearLines(this.truthRoot, this.truthFrames);
    this.track = track && track.t.length >= 2 ? track : null;
    this.placeMarkers();
    this.pruneFrames();
    this.applyOptions();
    for (const p of paths ?? []) {
      const f32 = new Float32Array(p.points.length);
      for (let k = 0; k < f32.length; k++) f32[k] = p.points[k] * U;
      const geo = new THREE.BufferGeometry();
      geo.setAttribute('position', new THREE.BufferAttribute(f32, 3));
      const line = new THREE.Line(geo, this.shared.truthLine);
      line.userData.kind = 'truth';
      this.frameIn(this.truthRoot, this.truthFrames, p.central).add(line);
    }
    this.requestRender();
  }

  /** Draws (or, with null, removes) another patched-conic flight of the plan, faint, as the comparison. */
  setComparison(result: PlanResult | null): void {
    this.clearLines(this.comparisonRoot, this.comparisonFrames);
    for (const seg of result?.segments ?? []) {
      const n = seg.sampleT.length;
      if (n < 2) continue;
      const f32 = new Float32Array(3 * n);
      for (let k = 0; k < 3 * n; k++) f32[k] = seg.samples[k] * U;
      const geo = new THREE.BufferGeometry();
      geo.setAttribute('position', new THREE.BufferAttribute(f32, 3));
      const line = new THREE.Line(geo, this.shared.comparison);
      line.userData.kind = 'comparison';
      this.frameIn(this.comparisonRoot, this.comparisonFrames, seg.central).add(line);
    }
    this.requestRender();
  }

  /**
   * Draws (or, with null, removes) the legs of a sequence solution (windows/sequencePaths.ts):
   * each leg's Lambert arc in its central body's frame, dashed in amber, dashes about 1 % of the
   * legs' extent.
   */
  setSequence(paths: readonly { central: number; points: Float64Array }[] | null): void {
    this.clearLines(this.sequenceRoot, this.sequenceFrames);
    let extent = 0;
    for (const p of paths ?? []) {
      const f32 = new Float32Array(p.points.length);
      for (let k = 0; k < f32.length; k++) f32[k] = p.points[k] * U;
      const geo = new THREE.BufferGeometry();
      geo.setAttribute('position', new THREE.BufferAttribute(f32, 3));
      geo.computeBoundingSphere();
      extent = Math.max(extent, geo.boundingSphere?.radius ?? 0);
      const line = new THREE.Line(geo, this.shared.sequenceLine);
      line.computeLineDistances();
      line.userData.kind = 'sequence';
      this.frameIn(this.sequenceRoot, this.sequenceFrames, p.central).add(line);
    }
    if (extent > 0) {
      this.shared.sequenceLine.dashSize = extent * 0.01;
      this.shared.sequenceLine.gapSize = extent * 0.006;
    }
    this.requestRender();
  }

  /** How many sequence legs are drawn (for tests). */
  sequenceLines(): number {
    let n = 0;
    this.sequenceRoot.traverse((o) => void (o.userData.kind === 'sequence' && n++));
    return n;
  }

  /** Draws the result's own coasts as the comparison (faint) or as the plan's path. */
  setResultAsComparison(on: boolean): void {
    if (on === this.resultIsComparison) return;
    this.resultIsComparison = on;
    const mat = on ? this.shared.comparison : this.shared.coast;
    this.resultRoot.traverse((o) => {
      if (o.userData.kind === 'coast') (o as THREE.Line).material = mat;
    });
    this.requestRender();
  }

  /** What the System view draws as the truth model's path and the comparison (for tests). */
  truthDrawing(): { truthLines: number; comparisonLines: number; resultIsComparison: boolean; shipOnTrack: boolean; markers: number; markersOnTrack: number } {
    let truthLines = 0;
    let comparisonLines = 0;
    this.truthRoot.traverse((o) => void (o.userData.kind === 'truth' && truthLines++));
    this.comparisonRoot.traverse((o) => void (o.userData.kind === 'comparison' && comparisonLines++));
    const s = [0, 0, 0];
    return {
      truthLines,
      comparisonLines,
      resultIsComparison: this.resultIsComparison,
      shipOnTrack: this.track !== null && trackPosition(this.track, this.t, s),
      markers: this.markers.length,
      markersOnTrack: this.markers.filter((m) => m.onTrack).length,
    };
  }

  /**
   * The plan's path drawn in `central`'s frame (the truth model's when it is n-body, else the
   * result's coasts), for tests: how many lines, and the closest drawn vertex to the body, m.
   */
  pathInFrame(central: number): { lines: number; closest: number } {
    const truth = this.truthFrames.get(central);
    const group = truth && truth.children.length > 0 ? truth : this.frames.get(central);
    let lines = 0;
    let closest = Number.POSITIVE_INFINITY;
    group?.traverse((o) => {
      const kind = o.userData.kind;
      if (kind !== 'truth' && kind !== 'coast') return;
      lines++;
      const geo = (o as THREE.Line).geometry;
      const p = geo.getAttribute('position');
      const n = Math.min(p.count, geo.drawRange.count);
      for (let k = 0; k < n; k++) closest = Math.min(closest, Math.hypot(p.getX(k), p.getY(k), p.getZ(k)) / U);
    });
    return { lines, closest };
  }

  private frameIn(root: THREE.Group, frames: Map<number, THREE.Group>, central: number): THREE.Group {
    let g = frames.get(central);
    if (!g) {
      g = new THREE.Group();
      frames.set(central, g);
      root.add(g);
    }
    return g;
  }

  /** Frees the lines' geometry (materials are shared) and empties the root. */
  private clearLines(root: THREE.Group, frames: Map<number, THREE.Group>): void {
    root.traverse((o) => (o as THREE.Line).geometry?.dispose());
    root.clear();
    frames.clear();
  }

  /**
   * Draws (or, with null, removes) the game-step check's flight (dashed and beaded at its sample
   * times, GAME_STYLE.game) and its
   * reference flight (thin chalk), each path in its central body's frame (gamestep/trackPaths.ts).
   * Dashes are measured along each path in units of 1/GAME_DASHES of its length, so every span
   * shows about the same number of dashes whatever its size.
   */
  setGameStep(paths: TrackPath[] | null): void {
    this.gameRoot.traverse((o) => (o as THREE.Line).geometry?.dispose());
    this.gameRoot.clear();
    this.gameFrames.clear();
    for (const p of paths ?? []) {
      let g = this.gameFrames.get(p.central);
      if (!g) {
        g = new THREE.Group();
        this.gameFrames.set(p.central, g);
        this.gameRoot.add(g);
      }
      const n = p.game.length / 3;
      const game = new Float32Array(p.game.length);
      const ref = new Float32Array(p.reference.length);
      for (let k = 0; k < game.length; k++) {
        game[k] = p.game[k] * U;
        ref[k] = p.reference[k] * U;
      }
      const along = new Float32Array(n);
      for (let k = 1; k < n; k++)
        along[k] = along[k - 1] + Math.hypot(game[3 * k] - game[3 * k - 3], game[3 * k + 1] - game[3 * k - 2], game[3 * k + 2] - game[3 * k - 1]);
      const total = along[n - 1] || 1;
      for (let k = 0; k < n; k++) along[k] *= GAME_DASHES / total;
      const gg = new THREE.BufferGeometry();
      gg.setAttribute('position', new THREE.BufferAttribute(game, 3));
      gg.setAttribute('lineDistance', new THREE.BufferAttribute(along, 1));
      const gl = new THREE.Line(gg, this.shared.gameLine);
      gl.renderOrder = 3;
      gl.userData.kind = 'game';
      const dots = new THREE.Points(gg, this.shared.gameDots);
      dots.renderOrder = 3;
      const rg = new THREE.BufferGeometry();
      rg.setAttribute('position', new THREE.BufferAttribute(ref, 3));
      const rl = new THREE.Line(rg, this.shared.gameReference);
      rl.renderOrder = 2;
      rl.userData.kind = 'game-reference';
      g.add(rl, gl, dots);
    }
    this.requestRender();
  }

  /** Shows or hides the game-step paths without rebuilding them. */
  setGameStepVisible(visible: boolean): void {
    this.gameRoot.visible = visible;
    this.requestRender();
  }

  /** Whether game-step paths are drawn and shown (for tests). */
  hasGameStep(): boolean {
    return this.gameRoot.visible && this.gameRoot.children.length > 0;
  }

  // ---------------------------------------------------------------- cheap changes

  setTime(t: number): void {
    if (t === this.t) return;
    this.t = t;
    this.requestRender();
  }

  getTime(): number {
    return this.t;
  }

  setFocus(focus: FocusTarget, frame = true): void {
    this.focus = focus;
    if (frame) this.frameFocus();
    this.requestRender();
  }

  getFocus(): FocusTarget {
    return this.focus;
  }

  setOptions(o: Partial<SceneOptions>): void {
    this.options = { ...this.options, ...o };
    this.applyOptions();
    this.requestRender();
  }

  private applyOptions(): void {
    const o = this.options;
    for (const b of this.bodies) {
      if (b.soi) b.soi.visible = o.showSoi;
      if (b.orbit) b.orbit.visible = o.showOrbits;
    }
    this.labels.domElement.style.display = o.showLabels ? '' : 'none';
    for (const m of this.markers) m.arrows.visible = o.showArrows;
  }

  /**
   * Frames the whole plan: the focus becomes the body whose frame holds every segment of the
   * flight and the given bodies (the innermost body all their central bodies orbit: the star for
   * an interplanetary plan, a planet for a transfer among its moons), and the camera backs off
   * until a sphere around that body holding the whole path, and the given bodies where they are
   * now and at the plan's end, fits the view's narrower field of view (so a narrow or short view
   * still shows the destination). Returns the focus it chose.
   */
  frameWholePlan(bodies: readonly number[] = []): FocusTarget {
    const sys = this.system;
    const result = this.result;
    if (!sys || !result || result.segments.length === 0) return this.focus;
    const { centre: common, radius: r } = planExtent(sys, result, bodies, [this.t, result.t0, result.t1]);
    this.focus = { kind: 'body', index: common };
    if (!(r > 0)) {
      this.frameFocus();
      return this.focus;
    }
    // the sphere of radius r fits a cone of half-angle θ at distance r / sin θ; θ: the narrower half field of view
    const halfV = (this.camera.fov * Math.PI) / 360;
    const halfH = Math.atan(Math.tan(halfV) * Math.max(1e-3, this.camera.aspect));
    const dist = (1.08 * r * U) / Math.sin(Math.min(halfV, halfH));
    const dir = this.camera.position.clone().sub(this.controls.target);
    if (dir.lengthSq() === 0) dir.set(0, -1, 0.6);
    dir.normalize().multiplyScalar(dist);
    this.controls.target.set(0, 0, 0);
    this.camera.position.copy(dir);
    this.controls.update();
    this.requestRender();
    return this.focus;
  }

  /** Puts the camera at a distance that shows the focused object and its surroundings. */
  frameFocus(): void {
    const sys = this.system;
    if (!sys) return;
    let dist: number;
    if (this.focus.kind === 'ship') dist = 60;
    else if (this.focus.index === 0) {
      // The star: frame the plan's heliocentric path, or the inner worlds.
      let r = 0;
      for (const seg of this.result?.segments ?? []) {
        if (seg.central !== 0) continue;
        for (let k = 0; k < seg.samples.length; k += 3) r = Math.max(r, Math.hypot(seg.samples[k], seg.samples[k + 1], seg.samples[k + 2]));
      }
      if (r === 0) for (const b of sys.bodies) if (b.parentIndex === 0) r = Math.max(r, Math.min(b.derived.apoapsis, 3e11));
      dist = 2.6 * r * U;
    } else {
      const b = this.bodies[this.focus.index];
      const moons = sys.bodies[this.focus.index].children.map((c) => sys.bodies[c].derived.apoapsis * U);
      dist = Math.max(b.radius * 7, Math.min(b.soiRadius * 0.6, moons.length ? Math.max(...moons) * 2.2 : b.radius * 40));
    }
    const dir = this.camera.position.clone().sub(this.controls.target);
    if (dir.lengthSq() === 0) dir.set(0, -1, 0.6);
    dir.normalize().multiplyScalar(dist);
    this.controls.target.set(0, 0, 0);
    this.camera.position.copy(dir);
    this.controls.update();
  }

  resize(): void {
    const w = Math.max(1, this.container.clientWidth);
    const h = Math.max(1, this.container.clientHeight);
    this.renderer.setSize(w, h, false);
    this.labels.setSize(w, h);
    this.camera.aspect = w / h;
    this.camera.updateProjectionMatrix();
    this.requestRender();
  }

  requestRender(): void {
    if (this.raf || this.disposed) return;
    this.raf = requestAnimationFrame(() => {
      this.raf = 0;
      this.renderNow();
    });
  }

  /** Updates every position for the current time and renders synchronously; returns the JS time, ms. */
  renderNow(): number {
    if (this.disposed) return 0;
    const t0 = performance.now();
    this.update();
    this.renderer.render(this.scene, this.camera);
    if (this.options.showLabels) this.labels.render(this.scene, this.camera);
    const ms = performance.now() - t0;
    this.stats.lastMs = ms;
    this.stats.frames++;
    this.onFrame?.(this.stats);
    return ms;
  }

  /** Ship position relative to the star at the current time (m), or null without a result. */
  shipPosition(): Float64Array | null {
    return this.result && this.shipCentral >= 0 ? this.shipWorld : null;
  }

  private update(): void {
    const sys = this.system;
    if (!sys) return;
    const n = sys.bodies.length;
    const w = this.world;
    for (let i = 1; i < n; i++) {
      bodyPosition(sys, i, this.t, this.tmp3, 0);
      w[3 * i] = this.tmp3[0];
      w[3 * i + 1] = this.tmp3[1];
      w[3 * i + 2] = this.tmp3[2];
    }
    // Ship: on the truth model's n-body flight when there is one, else on the plan's result.
    this.shipCentral = -1;
    if (this.track && trackPosition(this.track, this.t, this.shipWorld)) {
      this.shipCentral = 0;
    } else if (this.result) {
      const k = shipStateAt(this.result, this.t, this.ship6);
      if (k >= 0) {
        const c = this.result.segments[k].central;
        this.shipCentral = c;
        for (let j = 0; j < 3; j++) this.shipWorld[j] = w[3 * c + j] + this.ship6[j];
      }
    }
    // Floating origin.
    const o = this.origin;
    if (this.focus.kind === 'ship' && this.shipCentral >= 0) {
      o[0] = this.shipWorld[0];
      o[1] = this.shipWorld[1];
      o[2] = this.shipWorld[2];
    } else {
      const i = this.focus.kind === 'body' ? this.focus.index : 0;
      o[0] = w[3 * i];
      o[1] = w[3 * i + 1];
      o[2] = w[3 * i + 2];
    }
    const cam = this.camera.position;
    const pxPerRad = this.renderer.domElement.height / this.renderer.getPixelRatio() / (2 * Math.tan((this.camera.fov * Math.PI) / 360));
    // World units per pixel at distance d: d / pxPerRad.
    for (let i = 0; i < n; i++) {
      const b = this.bodies[i];
      const x = (w[3 * i] - o[0]) * U;
      const y = (w[3 * i + 1] - o[1]) * U;
      const z = (w[3 * i + 2] - o[2]) * U;
      b.group.position.set(x, y, z);
      const d = Math.hypot(x - cam.x, y - cam.y, z - cam.z);
      const upp = d / pxPerRad;
      const r = this.options.trueScale ? b.radius : Math.max(b.radius, 0.5 * b.minPx * upp);
      b.mesh.scale.setScalar(r);
      if (i === 0 && this.glow) this.glow.scale.setScalar(r * 9);
      if (b.orbit) {
        const p = b.parent;
        b.orbit.position.set((w[3 * p] - o[0]) * U, (w[3 * p + 1] - o[1]) * U, (w[3 * p + 2] - o[2]) * U);
      }
      // Declutter: a moon's label, orbit and shell only when it stands clear of its parent on screen.
      if (b.depth > 1) {
        const p = b.parent;
        const sep = Math.hypot(w[3 * i] - w[3 * p], w[3 * i + 1] - w[3 * p + 1], w[3 * i + 2] - w[3 * p + 2]) * U;
        const clear = sep / upp > 26;
        b.label.visible = clear;
        if (b.orbit) b.orbit.visible = this.options.showOrbits && clear;
        if (b.soi) b.soi.visible = this.options.showSoi && clear;
      }
      if (b.soi && b.depth === 1) b.soi.visible = this.options.showSoi && b.soiRadius / upp > 2;
      if (b.soi) {
        // The outline (limb) of the sphere seen from the camera: a circle of radius
        // R·√(1 − R²/d²) facing the camera, R²/d towards it from the centre; none from inside.
        const R = b.soiRadius;
        if (d <= R * 1.01) b.soi.visible = false;
        else if (b.soi.visible) {
          const k = (R * R) / (d * d);
          b.soi.position.set(x + (cam.x - x) * k, y + (cam.y - y) * k, z + (cam.z - z) * k);
          b.soi.scale.setScalar(R * Math.sqrt(1 - k));
          b.soi.quaternion.copy(this.camera.quaternion);
        }
      }
    }
    this.starLight.position.copy(this.bodies[0].group.position);
    this.nbodyLine?.position.copy(this.bodies[0].group.position);
    for (const [c, g] of this.frames) g.position.set((w[3 * c] - o[0]) * U, (w[3 * c + 1] - o[1]) * U, (w[3 * c + 2] - o[2]) * U);
    for (const [c, g] of this.gameFrames) g.position.set((w[3 * c] - o[0]) * U, (w[3 * c + 1] - o[1]) * U, (w[3 * c + 2] - o[2]) * U);
    for (const [c, g] of this.truthFrames) g.position.set((w[3 * c] - o[0]) * U, (w[3 * c + 1] - o[1]) * U, (w[3 * c + 2] - o[2]) * U);
    for (const [c, g] of this.comparisonFrames) g.position.set((w[3 * c] - o[0]) * U, (w[3 * c + 1] - o[1]) * U, (w[3 * c + 2] - o[2]) * U);
    for (const [c, g] of this.sequenceFrames) g.position.set((w[3 * c] - o[0]) * U, (w[3 * c + 1] - o[1]) * U, (w[3 * c + 2] - o[2]) * U);
    for (const m of this.markers) {
      m.group.position.copy(m.rel);
      const gp = this.frames.get(m.central)!.position;
      const d = this.v.copy(m.rel).add(gp).sub(cam).length();
      const upp = d / pxPerRad;
      m.group.scale.setScalar(upp);
      m.group.children[0].scale.setScalar(MARKER_PX * 0.5);
      m.group.children[1].scale.setScalar(MARKER_PX * 0.5);
      m.group.children[1].quaternion.copy(this.camera.quaternion);
      m.arrows.scale.setScalar(ARROW_PX);
    }
    if (this.shipCentral >= 0) {
      const x = (this.shipWorld[0] - o[0]) * U;
      const y = (this.shipWorld[1] - o[1]) * U;
      const z = (this.shipWorld[2] - o[2]) * U;
      this.ship.position.set(x, y, z);
      this.ship.scale.setScalar((SHIP_PX * 0.5 * Math.hypot(x - cam.x, y - cam.y, z - cam.z)) / pxPerRad);
      this.ship.visible = true;
    } else this.ship.visible = false;
  }

  /** Fraction of canvas pixels that differ from the background (for tests: "not blank"); renders first. */
  nonBackgroundFraction(): number {
    this.renderNow();
    const gl = this.renderer.getContext();
    const w = gl.drawingBufferWidth;
    const h = gl.drawingBufferHeight;
    const px = new Uint8Array(w * h * 4);
    gl.readPixels(0, 0, w, h, gl.RGBA, gl.UNSIGNED_BYTE, px);
    const hex = parseInt(PALETTE.ground.slice(1), 16);
    const br = (hex >> 16) & 255;
    const bgG = (hex >> 8) & 255;
    const bb = hex & 255;
    let differ = 0;
    for (let k = 0; k < px.length; k += 4) {
      if (Math.abs(px[k] - br) + Math.abs(px[k + 1] - bgG) + Math.abs(px[k + 2] - bb) > 24) differ++;
    }
    return differ / (w * h);
  }

  dispose(): void {
    this.disposed = true;
    if (this.raf) cancelAnimationFrame(this.raf);
    this.controls.dispose();
    this.clearGroup(this.systemRoot);
    this.clearResult();
    this.setGameStep(null);
    this.clearLines(this.truthRoot, this.truthFrames);
    this.clearLines(this.comparisonRoot, this.comparisonFrames);
    this.clearLines(this.sequenceRoot, this.sequenceFrames);
    this.shared.dispose();
    this.renderer.dispose();
    this.renderer.domElement.remove();
    this.labels.domElement.remove();
  }
}
