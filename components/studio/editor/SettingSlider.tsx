'use client';
// A setting dragged on a slider: shown live while held (one preview), made one undoable edit when
// let go. `percent` shows a share (0–1) as a percentage.

export function SettingSlider({
  label,
  value,
  min,
  max,
  step,
  unit,
  percent = false,
  onPreview,
  onFinish,
}: {
  label: string;
  value: number;
  min: number;
  max: number;
  step: number;
  unit?: string;
  percent?: boolean;
  onPreview: (value: number) => void;
  onFinish: () => void;
}) {
  return (
    <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
      <span className="flex justify-between">
        {label}
        <span className="tabular-nums text-loam">{percent ? `${Math.round(value * 100)} %` : `${value}${unit ?? ''}`}</span>
      </span>
      <input
        type="range"
        min={min}
        max={max}
        step={step}
        value={value}
        onChange={(event) => onPreview(Number(event.target.value))}
        onPointerUp={onFinish}
        onKeyUp={onFinish}
        onBlur={onFinish}
        className="accent-bracken"
      />
    </label>
  );
}
