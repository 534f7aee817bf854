/** Shown wherever a safety-critical characteristic is entered or charted (PRODUCT.md: Cautions). */
export function SafetyCaution() {
  return (
    <div class="caution" role="note" data-testid="safety-caution">
      <strong>Safety-critical characteristic.</strong> This control chart does not replace the inspection,
      containment and release steps required by the site's control plan and quality system, nor by applicable
      regulations and codes. Parts outside specification follow the site's nonconforming-material procedure.
    </div>
  );
}
