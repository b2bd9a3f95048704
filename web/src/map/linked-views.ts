/**
 * Linked pan and zoom of the compare view's two maps: moving one map (drag, wheel, buttons, keys)
 * moves every other map of the link to the same centre and zoom at once. A move made by the link
 * itself is not passed on again (no echo between the maps).
 */
import type * as maplibregl from 'maplibre-gl';

export class ViewLink {
  private readonly maps = new Set<maplibregl.Map>();
  private syncing = false;

  /** Add a map to the link (it takes the others' view from its next move on); returns the remover. */
  add(map: maplibregl.Map): () => void {
    const onMove = () => this.follow(map);
    this.maps.add(map);
    map.on('move', onMove);
    return () => {
      map.off('move', onMove);
      this.maps.delete(map);
    };
  }

  private follow(source: maplibregl.Map): void {
    if (this.syncing) return;
    this.syncing = true;
    try {
      const center = source.getCenter();
      const zoom = source.getZoom();
      for (const m of this.maps) if (m !== source) m.jumpTo({ center, zoom });
    } finally {
      this.syncing = false;
    }
  }
}
