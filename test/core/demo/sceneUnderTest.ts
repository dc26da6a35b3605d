import { fromArrayBuffer } from 'geotiff';
import { demoFiles, type DemoFile } from '../../../src/core/demo/files.ts';
import { synthesizeDemo, type DemoScene } from '../../../src/core/demo/synthesize.ts';

// One reduced-size demo scene per test file, with its rasters read back from the
// written GeoTIFF bytes by geotiff.js (3.0.5, npm), so the checks look at the files.

export interface ReadBack {
  width: number;
  height: number;
  bands: Uint16Array[];
}

export interface SceneUnderTest {
  scene: DemoScene;
  files: Map<string, DemoFile>;
  read(name: string): Promise<ReadBack>;
  json<T>(name: string): T;
}

export async function readTiff(bytes: Uint8Array): Promise<ReadBack> {
  const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  const tiff = await fromArrayBuffer(buffer);
  const image = await tiff.getImage();
  const rasters = (await image.readRasters()) as unknown as Uint16Array[];
  return { width: image.getWidth(), height: image.getHeight(), bands: Array.from(rasters) };
}

export async function sceneUnderTest(seed: number, size: number): Promise<SceneUnderTest> {
  const scene = synthesizeDemo({ seed, size });
  const files = new Map((await demoFiles(scene)).map((f) => [f.name, f]));
  const cache = new Map<string, Promise<ReadBack>>();
  const get = (name: string) => {
    const file = files.get(name);
    if (!file) throw new Error(`no demo file ${name}`);
    return file;
  };
  return {
    scene,
    files,
    read(name) {
      if (!cache.has(name)) cache.set(name, readTiff(get(name).bytes));
      return cache.get(name)!;
    },
    json<T>(name: string) {
      return JSON.parse(new TextDecoder().decode(get(name).bytes)) as T;
    },
  };
}
