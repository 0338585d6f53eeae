export default function ComparePage() {
  return null;
}
