"use client";
// The part in 3D: clay body, overhang facets in violet, the printer's bed to scale with a 10 mm grid,
// open or non-manifold edges as yellow lines on demand. Z is up in the file; three.js has Y up.
import { Bounds, GizmoHelper, GizmoViewport, OrbitControls } from "@react-three/drei";
import { Canvas } from "@react-three/fiber";
import { useEffect, useMemo } from "react";
import { BufferAttribute, BufferGeometry, Color } from "three";

export interface ViewerProps {
  positions: Float32Array;
  overhangMask: Uint8Array;
  bed: { x: number; y: number; name: string } | null;
  edges: Float32Array;
  showProblems: boolean;
  /**
   * The positions are already in bed coordinates (a plate: x, y from the bed's front-left corner,
   * as "Bed from above" draws them): draw them there instead of centring the part on the bed.
   */
  onBed?: boolean;
}

const CLAY = new Color("#c8a27c");
const OVERHANG = new Color("#7b4fd6");

function bounds(p: Float32Array) {
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < p.length; i++) {
    const k = i % 3;
    if (p[i]! < min[k]!) min[k] = p[i]!;
    if (p[i]! > max[k]!) max[k] = p[i]!;
  }
  return { min, max };
}

function usePartGeometry(positions: Float32Array, mask: Uint8Array) {
  const geo = useMemo(() => {
    const g = new BufferGeometry();
    g.setAttribute("position", new BufferAttribute(positions, 3));
    const colors = new Float32Array(positions.length);
    for (let t = 0; t < positions.length / 9; t++) {
      const c = mask[t] ? OVERHANG : CLAY;
      for (let v = 0; v < 3; v++) colors.set([c.r, c.g, c.b], t * 9 + v * 3);
    }
    g.setAttribute("color", new BufferAttribute(colors, 3));
    g.computeVertexNormals();
    return g;
  }, [positions, mask]);
  useEffect(() => () => geo.dispose(), [geo]);
  return geo;
}

function useLines(points: Float32Array) {
  const geo = useMemo(() => {
    const g = new BufferGeometry();
    g.setAttribute("position", new BufferAttribute(points, 3));
    return g;
  }, [points]);
  useEffect(() => () => geo.dispose(), [geo]);
  return geo;
}

function gridPoints(x: number, y: number, step = 10): Float32Array {
  const out: number[] = [];
  for (let i = 0; i <= x + 1e-6; i += step) out.push(i - x / 2, -y / 2, 0, i - x / 2, y / 2, 0);
  for (let j = 0; j <= y + 1e-6; j += step) out.push(-x / 2, j - y / 2, 0, x / 2, j - y / 2, 0);
  return new Float32Array(out);
}

export function MeshViewer({ positions, overhangMask, bed, edges, showProblems, onBed = false }: ViewerProps) {
  const geo = usePartGeometry(positions, overhangMask);
  const box = useMemo(() => bounds(positions), [positions]);
  const edgeGeo = useLines(edges);
  const bedSize = bed ?? { x: Math.max(box.max[0]! - box.min[0]!, 50) * 1.4, y: Math.max(box.max[1]! - box.min[1]!, 50) * 1.4, name: "" };
  const grid = useLines(useMemo(() => gridPoints(bedSize.x, bedSize.y), [bedSize.x, bedSize.y]));
  // Centre the part on the bed, its lowest point touching it (a plate keeps the plan's own positions).
  const offset: [number, number, number] = onBed && bed ? [-bed.x / 2, -bed.y / 2, 0] : [-(box.min[0]! + box.max[0]!) / 2, -(box.min[1]! + box.max[1]!) / 2, -box.min[2]!];
  return (
    <Canvas gl={{ preserveDrawingBuffer: true, antialias: true }} camera={{ position: [120, 120, 160], fov: 40, near: 0.1, far: 20000 }} style={{ background: "#eeeae1" }}>
      <ambientLight intensity={0.6} />
      <directionalLight position={[200, 400, 300]} intensity={1.6} />
      <directionalLight position={[-300, 150, -200]} intensity={0.5} />
      <Bounds fit clip observe margin={1.3}>
        <group rotation={[-Math.PI / 2, 0, 0]}>
          <mesh position={[0, 0, -0.2]}>
            <planeGeometry args={[bedSize.x, bedSize.y]} />
            <meshStandardMaterial color="#b9b6ae" />
          </mesh>
          <lineSegments geometry={grid} position={[0, 0, -0.1]}>
            <lineBasicMaterial color="#8f8b82" />
          </lineSegments>
          <group position={offset}>
            <mesh geometry={geo}>
              <meshStandardMaterial vertexColors roughness={0.8} metalness={0} />
            </mesh>
            <lineSegments geometry={edgeGeo} visible={showProblems}>
              <lineBasicMaterial color="#e0b400" depthTest={false} />
            </lineSegments>
          </group>
        </group>
      </Bounds>
      <OrbitControls makeDefault />
      <GizmoHelper alignment="bottom-right" margin={[56, 56]}>
        <GizmoViewport labelColor="white" axisHeadScale={0.9} />
      </GizmoHelper>
    </Canvas>
  );
}
