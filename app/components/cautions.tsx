/** The model caution, short form, for the footer of every page. */
export function FooterCaution() {
  return (
    <p>
      Fernwater is a model, not a water test. Test your water; act on real ammonia or nitrite readings at once; change
      water with temperature-matched, dechlorinated water; never release aquarium plants or animals into the wild.
    </p>
  );
}
