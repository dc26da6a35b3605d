/** How many polygons carry each value of a property (e.g. species code). */
export function fieldCounts(collection: { features: { properties: Record<string, unknown> | null }[] }, property: string): Map<string, number> {
  const counts = new Map<string, number>();
  for (const feature of collection.features) {
    const value = String(feature.properties?.[property] ?? '');
    counts.set(value, (counts.get(value) ?? 0) + 1);
  }
  return counts;
}
