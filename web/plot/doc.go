// Package plot draws the notebook's figures as SVG text: scatter and line
// charts on linear or logarithmic axes, boxes, error bars and stacked bars.
// It is small on purpose (the page's WebAssembly stays light) and knows no
// science: callers hand it numbers, labels and units.
//
// Every series carries its meaning in its marker shape, line dash or
// hatching as well as its colour, so that a chart printed in black and white
// still reads. All text is escaped; nothing a file holds becomes markup.
//
// A chart is drawn in three steps:
//  1. New gives a Chart of a size, with its axis labels (units included);
//  2. the Add methods put series, boxes and bars on it, widening the axes;
//  3. SVG returns the finished drawing.
package plot
