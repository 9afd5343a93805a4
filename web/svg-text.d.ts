/** An SVG file imported as its text (angular.json's `loader` for `.svg`). */
declare module '*.svg' {
  const text: string;
  export default text;
}
