/**
 * Texture class codes used by every grid in the product (uint8 in GeoTIFFs, 0 = nodata). Defined in
 * physics, where the soil catalogue keys its defaults by them; screening re-exports them.
 */
export const TEXTURE_CODES = {
  1: 'gravel',
  2: 'sand',
  3: 'silt',
  4: 'clay',
  5: 'peat',
  6: 'bedrock',
} as const;
export type TextureCode = keyof typeof TEXTURE_CODES;
export type TextureName = (typeof TEXTURE_CODES)[TextureCode];
