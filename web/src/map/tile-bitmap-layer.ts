/**
 * The bitmap layer of one screening tile: deck.gl's BitmapLayer with a shorter fragment shader. The
 * tiles are drawn as given (default image coordinates, no desaturation, no tint, no transparent
 * colour), for which BitmapLayer's own shader (MIT, vis.gl contributors) reduces to the texture's
 * colour with the layer's opacity; its branches for coordinate conversion (logarithm, tangent and
 * exponential per pixel) and colour adjustment are left out, which matters where the GPU is emulated
 * in software (issue 18: the map drawn after a filter edit). Same pixels; picking kept as in deck.gl.
 */
import { BitmapLayer } from '@deck.gl/layers';

const FRAGMENT_SHADER = `\
#version 300 es
#define SHADER_NAME screening-tile-fragment-shader

#ifdef GL_ES
precision highp float;
#endif

uniform sampler2D bitmapTexture;

in vec2 vTexCoord;
in vec2 vTexPos;

out vec4 fragColor;

vec3 packUVsIntoRGB(vec2 uv) {
  vec2 uv8bit = floor(uv * 256.);
  vec2 uvFraction = fract(uv * 256.);
  vec2 uvFraction4bit = floor(uvFraction * 16.);
  float fractions = uvFraction4bit.x + uvFraction4bit.y * 16.;
  return vec3(uv8bit, fractions) / 255.;
}

void main(void) {
  vec2 uv = vTexCoord;
  vec4 bitmapColor = texture(bitmapTexture, uv);
  fragColor = vec4(bitmapColor.rgb, bitmapColor.a * layer.opacity);
  geometry.uv = uv;
  DECKGL_FILTER_COLOR(fragColor, geometry);
  if (bool(picking.isActive) && !bool(picking.isAttribute)) {
    fragColor.rgb = packUVsIntoRGB(uv);
  }
}
`;

export class TileBitmapLayer extends BitmapLayer {
  static override layerName = 'TileBitmapLayer';
  override getShaders() {
    return { ...super.getShaders(), fs: FRAGMENT_SHADER };
  }
}
